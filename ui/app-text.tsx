import { Text, type TextProps } from 'react-native';
import { colors, type as typeScale } from './theme';

export type TextVariant = keyof typeof typeScale;

type Props = TextProps & { variant?: TextVariant; color?: string };

export function AppText({ variant = 'body', color = colors.text, style, ...rest }: Props) {
  return <Text {...rest} style={[typeScale[variant], { color }, style]} />;
}
