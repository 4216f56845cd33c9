import { useEffect, useRef } from 'react';
import { Text } from 'react-native';
import type { TextVariant } from './app-text';
import { colors, type as typeScale } from './theme';

type Props = {
  /** The whole text: shown up to `lines` lines, then cut with an ellipsis; the whole of it on hover. */
  text: string;
  lines?: number;
  variant?: TextVariant;
  color?: string;
  testID?: string;
};

/**
 * A name or label in a narrow column: it stays inside its column (the caller's column has `minWidth: 0`), ends with
 * an ellipsis when it does not fit, and gives the whole text to a pointer's hover (the browser's title) and to a
 * screen reader.
 */
export function ClippedText({ text, lines = 1, variant = 'small', color = colors.text, testID }: Props) {
  const ref = useRef<Text>(null);
  // react-native-web does not pass `title` on; on the web the ref is the element itself, so set it there.
  useEffect(() => {
    const node = ref.current as unknown as { setAttribute?: (name: string, value: string) => void } | null;
    node?.setAttribute?.('title', text);
  }, [text]);
  return (
    <Text
      ref={ref}
      numberOfLines={lines}
      accessibilityLabel={text}
      testID={testID}
      style={[typeScale[variant], { color, maxWidth: '100%' }]}
    >
      {text}
    </Text>
  );
}
