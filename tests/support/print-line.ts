/** A line a test prints for the reader of the run (how many inputs it tried, say), not a log. */
export function printLine(text: string): void {
  console.log(text)
}
