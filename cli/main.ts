/**
 * bitslack: the timing check of an isolated link for a build script.
 *
 *   bitslack check LINK.json [--baud N] [--required-margin UI] [--sclk HZ] [--json]
 *   bitslack check --server URL --token T --link ID [same options]
 *   bitslack diff A.json B.json [--json]
 *
 * Exit codes: 0 the link passes; 1 it fails or is marginal (it lost its required margin);
 * 2 the input cannot be checked (a missing or malformed file, a field the schema refuses, a
 * server that refuses the token or the link, a bad option). Locally it runs the app's own
 * engine (server/timing); against a server it asks the stored link's analysis with an API token.
 */
import { Command, CommanderError, InvalidArgumentError, Option } from 'commander'
import { analyzeParsedLink, ENGINE_VERSION } from '../server/timing'
import type { LinkAnalysis } from '../shared/types/analysis'
import { parseEng } from '../shared/utils/units'
import { applyOverrides, checkText, CliInputError, exitCodeOf, EXIT, parseForCheck, readLinkFile, summariseForCheck, type Overrides } from './check'
import { diffLinks, diffText } from './diff'

function quantity(unit: string, what: string) {
  return (text: string) => {
    const r = parseEng(text, unit)
    if (!r.ok) throw new InvalidArgumentError(`${what}: ${r.message}`)
    return r.value
  }
}

interface CheckOptions extends Overrides {
  json?: boolean
  server?: string
  token?: string
  link?: string
}

/** The stored link's analysis from a Bitslack server, with the overrides applied there by the same engine. */
async function analyseOnServer(o: CheckOptions): Promise<LinkAnalysis> {
  if (!o.token) throw new CliInputError('--server needs --token (or BITSLACK_TOKEN): create one on your account page')
  if (!o.link || !/^[1-9][0-9]*$/.test(o.link)) throw new CliInputError('--server needs --link with the link\'s number (the N of /links/N)')
  const base = o.server!.replace(/\/+$/, '')
  const headers = { authorization: `Bearer ${o.token}`, accept: 'application/json' }
  const call = async (path: string, init: RequestInit = {}) => {
    let res: Response
    try {
      res = await fetch(base + path, { ...init, headers: { ...headers, ...(init.headers as Record<string, string>) } })
    } catch (err) {
      throw new CliInputError(`cannot reach ${base}: ${(err as Error).cause instanceof Error ? ((err as Error).cause as Error).message : (err as Error).message}`)
    }
    const text = await res.text()
    if (!res.ok) {
      let message = text.slice(0, 300)
      try {
        message = (JSON.parse(text) as { message?: string; statusMessage?: string }).message ?? message
      } catch {
        // not JSON: the text as it came
      }
      throw new CliInputError(`${base}${path} answered ${res.status}: ${message}`)
    }
    return JSON.parse(text) as unknown
  }
  if (o.baud === undefined && o.requiredMargin === undefined && o.sclk === undefined) return (await call(`/api/links/${o.link}/analysis`)) as LinkAnalysis
  const link = applyOverrides(await call(`/links/${o.link}/link.json`), o)
  return (await call('/api/analyze', { method: 'POST', body: JSON.stringify(link), headers: { 'content-type': 'application/json' } })) as LinkAnalysis
}

function analyseFile(file: string, o: Overrides): LinkAnalysis {
  return analyzeParsedLink(parseForCheck(applyOverrides(readLinkFile(file), o), file))
}

export function program(): Command {
  const cli = new Command('bitslack')
    .description('Timing check of a link across galvanic isolation (UART, SPI), for build scripts')
    .version(ENGINE_VERSION, '-V, --version', 'the engine version')
    .exitOverride()
    .configureOutput({ outputError: (text, write) => write(text) })

  cli
    .command('check')
    .description('analyse a link and exit 0 when it passes, 1 when it fails or lost its margin, 2 on bad input')
    .argument('[link]', 'link JSON file (as downloaded from a link page or a report)')
    .option('--baud <rate>', 'UART rate to check instead of the link\'s (115200, 1M)', quantity('Bd', '--baud'))
    .option('--required-margin <ui>', 'UART margin every bit must keep, unit intervals (0.1)', quantity('', '--required-margin'))
    .option('--sclk <hz>', 'SPI clock to check instead of the link\'s (10M)', quantity('Hz', '--sclk'))
    .option('--json', 'print the summary as JSON')
    .option('--server <url>', 'check a stored link on a Bitslack server instead of a file')
    .addOption(new Option('--token <token>', 'API token for --server').env('BITSLACK_TOKEN'))
    .option('--link <id>', 'the stored link\'s number, with --server')
    .action(async (file: string | undefined, o: CheckOptions) => {
      if (o.server && file) throw new CliInputError('give a link file or --server with --link, not both')
      if (!o.server && !file) throw new CliInputError('give a link file, or --server URL --token T --link ID')
      const analysis = o.server ? await analyseOnServer(o) : analyseFile(file!, o)
      const summary = summariseForCheck(analysis)
      console.log(o.json ? JSON.stringify(summary, null, 2) : checkText(summary))
      process.exitCode = exitCodeOf(summary.verdict)
    })

  cli
    .command('diff')
    .description('what changed between two links: inputs, verdict and margins, biggest change first')
    .argument('<a>', 'the earlier link JSON')
    .argument('<b>', 'the later link JSON')
    .option('--json', 'print the differences as JSON')
    .action((fileA: string, fileB: string, o: { json?: boolean }) => {
      const a = parseForCheck(readLinkFile(fileA), fileA)
      const b = parseForCheck(readLinkFile(fileB), fileB)
      const d = diffLinks(a, b, analyzeParsedLink(a), analyzeParsedLink(b))
      console.log(o.json ? JSON.stringify(d, null, 2) : diffText(d, `${a.name} (${fileA})`, `${b.name} (${fileB})`))
      process.exitCode = EXIT.pass
    })
  return cli
}

export async function main(argv: string[]): Promise<number> {
  try {
    await program().parseAsync(argv)
    return Number(process.exitCode ?? 0)
  } catch (err) {
    if (err instanceof CommanderError) return err.exitCode === 0 ? 0 : EXIT.badInput
    if (err instanceof CliInputError) {
      console.error(`bitslack: ${err.message}`)
      return EXIT.badInput
    }
    console.error(`bitslack: ${err instanceof Error ? err.message : String(err)}`)
    return EXIT.badInput
  }
}
