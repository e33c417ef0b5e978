/** Merging warning lists: a warning given by two stages is reported once. */

/** `list` followed by the warnings of `more` that it does not hold yet. */
export function mergeWarnings(list: readonly string[], more: readonly string[]): string[] {
  const out = [...list];
  for (const w of more) if (!out.includes(w)) out.push(w);
  return out;
}
