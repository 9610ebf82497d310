/** How the client counts things in words: "1 block", "2 blocks", "0 nights". */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}
