/** `first_name` → `firstName`, at the type level. */
type CamelCase<S extends string> = S extends `${infer Head}_${infer Tail}`
  ? `${Head}${Capitalize<CamelCase<Tail>>}`
  : S;
type Words<S extends string> = S extends `${infer Word} ${infer Rest}` ? Word | Words<Rest> : S;
type Fields<S extends string> = CamelCase<Words<S>>;

/** The column list itself when it names exactly the record's fields, else the fields it lacks or has too many. */
type MatchingColumns<R, S extends string, Computed> =
  Exclude<keyof R, Fields<S> | keyof Computed> extends never
    ? Exclude<Fields<S>, keyof R> extends never
      ? S
      : `not a field of the record: ${Exclude<Fields<S>, keyof R> & string}`
    : `missing a column for: ${Exclude<keyof R, Fields<S> | keyof Computed> & string}`;

const camelCase = (column: string) =>
  column.replace(/_([a-z])/g, (_, letter: string) => letter.toUpperCase());

/**
 * The phone's tables name their columns in snake_case; the records the screens use name the same fields in
 * camelCase. `selectInto<LocalClient>()('id first_name …')` writes the select list that reads a row straight into
 * the record's shape (`first_name AS "firstName"`), so no table needs a function restating every field. The list
 * (one line, columns apart by single spaces) is checked against the record: a field it lacks or a column the record
 * does not have fails to typecheck. `computed` names fields read from an SQL expression instead of a column.
 */
export function selectInto<R>() {
  return <S extends string, Computed extends Partial<Record<keyof R, string>> = Record<never, string>>(
    columns: MatchingColumns<R, S, Computed> & S,
    computed?: Computed,
  ): string =>
    [
      ...columns.split(' ').map((column) => {
        const field = camelCase(column);
        return field === column ? column : `${column} AS "${field}"`;
      }),
      ...Object.entries(computed ?? {}).map(([field, sql]) => `${String(sql)} AS "${field}"`),
    ].join(', ');
}
