export async function main(argv: readonly string[]): Promise<number> {
  const x: number = 3;
  process.stdout.write(`hello ${argv.join(' ')} ${x}\n`);
  return 0;
}
