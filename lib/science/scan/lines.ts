/**
 * Call `fn` for every line of `text` (1-based line numbers), without building an array of lines.
 * `text` must use "\n" line breaks (parseScan normalises "\r\n" and "\r" first). Return `false` from `fn` to stop.
 */
export function forEachLine(text: string, fn: (line: string, lineNo: number) => boolean | void): void {
  let start = 0;
  let lineNo = 1;
  const n = text.length;
  while (start <= n) {
    let end = text.indexOf("\n", start);
    if (end < 0) end = n;
    if (fn(text.slice(start, end), lineNo) === false) return;
    start = end + 1;
    lineNo++;
  }
}

/** True for characters that open a comment line in XY/CSV scan files: `#`, `!`, and `;` unless `;` separates fields. */
export function isCommentStart(ch: string, semicolonIsSeparator: boolean): boolean {
  return ch === "#" || ch === "!" || (ch === ";" && !semicolonIsSeparator);
}
