import { Link, type Href } from 'expo-router';
import { Fragment } from 'react';
import { colors } from './theme';
import { AppText } from './app-text';

const urlPattern = /(https?:\/\/[^\s<>"]+)/g;

/** Text whose web addresses are real links (an e-mail's body, as a mail program would show it). */
export function LinkedText({ text, testID }: { text: string; testID?: string }) {
  const parts = text.split(urlPattern);
  return (
    <AppText variant="body" color={colors.text} testID={testID}>
      {parts.map((part, index) =>
        // split() with one capture group puts the matches at the odd indexes.
        index % 2 === 1 ? (
          <Link
            key={index}
            href={part as Href}
            style={{ color: colors.accent, textDecorationLine: 'underline' }}
          >
            {part}
          </Link>
        ) : (
          <Fragment key={index}>{part}</Fragment>
        ),
      )}
    </AppText>
  );
}
