import type { ReactNode } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { colors, radii, space } from './theme';
import { AppText } from './app-text';
import { Button } from './button';
import { Pager } from './pager';
import type { PageInfo } from '@/shared/protocol/practice';

export function LoadingState({ label, testID }: { label: string; testID: string }) {
  return (
    <View style={styles.box} testID={testID}>
      <ActivityIndicator color={colors.ink} />
      <AppText variant="small" color={colors.textMuted}>
        {label}
      </AppText>
    </View>
  );
}

export function EmptyState({ title, detail, testID }: { title: string; detail?: string; testID: string }) {
  return (
    <View style={styles.box} testID={testID}>
      <AppText variant="heading" color={colors.ink}>
        {title}
      </AppText>
      {detail ? (
        <AppText variant="small" color={colors.textMuted} style={styles.center}>
          {detail}
        </AppText>
      ) : null}
    </View>
  );
}

export function ErrorState({
  message,
  onRetry,
  testID,
}: {
  message: string;
  onRetry: () => void;
  testID: string;
}) {
  return (
    <View style={[styles.box, styles.error]} testID={testID}>
      <AppText variant="bodyStrong" color={colors.danger}>
        Could not load
      </AppText>
      <AppText variant="small" color={colors.text} style={styles.center}>
        {message}
      </AppText>
      <Button label="Try again" variant="secondary" onPress={onRetry} testID={`${testID}-retry`} />
    </View>
  );
}

type QueryLike<T> = {
  isPending: boolean;
  isError: boolean;
  error: Error | null;
  data: T | undefined;
  refetch: () => unknown;
};

/**
 * What an empty answer says: `when` tells an empty answer from one with something to show; without it, an answer
 * that is a list is empty when it has no items.
 */
export type EmptyWords<T> = { when?: (data: T) => boolean; title: string; detail?: string };

const isEmptyList = (data: unknown) => Array.isArray(data) && data.length === 0;

/**
 * One query's loading and error states (test ids `${testID}-loading` and `${testID}-error`, with a retry), the
 * empty state when the answer is empty (`empty`) (`${testID}-empty`), then `children` with its data: the same ladder on every
 * screen that loads something.
 */
export function QueryView<T>({
  query,
  loading,
  testID,
  empty,
  children,
}: {
  query: QueryLike<T>;
  loading: string;
  testID: string;
  empty?: EmptyWords<T>;
  children: (data: T) => ReactNode;
}) {
  if (query.isPending) return <LoadingState label={loading} testID={`${testID}-loading`} />;
  if (query.isError) {
    return (
      <ErrorState
        message={query.error?.message ?? ''}
        onRetry={() => void query.refetch()}
        testID={`${testID}-error`}
      />
    );
  }
  const data = query.data as T;
  if (empty && (empty.when ?? isEmptyList)(data))
    return <EmptyState title={empty.title} detail={empty.detail} testID={`${testID}-empty`} />;
  return <>{children(data)}</>;
}

/**
 * One page of a longer list: QueryView's states, then the page's rows and a Pager under them (`${testID}-pager`)
 * that moves by the page the server says it answered.
 */
export function PagedQueryView<T extends { pageInfo: PageInfo }>({
  onPage,
  children,
  ...view
}: {
  query: QueryLike<T>;
  loading: string;
  testID: string;
  empty: EmptyWords<T>;
  onPage: (page: number) => void;
  children: (data: T) => ReactNode;
}) {
  return (
    <QueryView {...view}>
      {(data) => (
        <>
          {children(data)}
          <Pager
            page={data.pageInfo.page}
            pageSize={data.pageInfo.pageSize}
            total={data.pageInfo.total}
            onPage={onPage}
            testID={`${view.testID}-pager`}
          />
        </>
      )}
    </QueryView>
  );
}

const styles = StyleSheet.create({
  box: {
    alignItems: 'center',
    justifyContent: 'center',
    gap: space.sm,
    paddingVertical: space.xxl,
    paddingHorizontal: space.lg,
    borderRadius: radii.lg,
    borderWidth: 1,
    borderColor: colors.line,
    borderStyle: 'dashed',
  },
  error: { borderStyle: 'solid', borderColor: colors.danger, backgroundColor: colors.dangerSoft },
  center: { textAlign: 'center' },
});
