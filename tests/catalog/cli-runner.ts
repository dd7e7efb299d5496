/** Runs the command line in this process, with stdout and stderr caught as text. */
import { main } from '../../catalog/cli'

function sink() {
  let text = ''
  return { write: (s: string) => { text += s; return true }, get text() { return text } }
}

export async function runCli(args: string[]) {
  const out = sink()
  const err = sink()
  const code = await main(args, out as unknown as typeof process.stdout, err as unknown as typeof process.stderr)
  return { code, out: out.text, err: err.text }
}
