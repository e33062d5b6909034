/** `beatforce COMMAND ...`: the command line over the library (design §9). */
import { VERSION } from '../src/version.js';
import { COMMANDS } from './commands/index.js';
import { EXIT, processIo, UsageError, type Io } from './io.js';

export function help(): string {
  const width = Math.max(...COMMANDS.map((c) => c.name.length));
  return `beatforce ${VERSION}: inertial loads on an oscillating mass carried by a turning body

usage: beatforce COMMAND [options]

commands:
${COMMANDS.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`).join('\n')}

  beatforce COMMAND --help    options of one command
  beatforce --version         the version

Quantities are numbers in SI base units or strings with units ('7 ug', '170 Hz', '80 deg').
Exit codes: 0 done, 1 usage error, 2 invalid scenario or sweep request, 3 over a limit.
Numbers support research and design; they do not certify a navigation or safety sensor.
`;
}

export function main(argv: readonly string[], io: Io = processIo): number {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    io.out(help());
    return name === undefined ? EXIT.usage : EXIT.ok;
  }
  if (name === '--version') {
    io.out(`${VERSION}\n`);
    return EXIT.ok;
  }
  const cmd = COMMANDS.find((c) => c.name === name);
  if (!cmd) {
    io.err(`beatforce: unknown command '${name}'\n\n${help()}`);
    return EXIT.usage;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.out(`usage: ${cmd.usage}\n`);
    return EXIT.ok;
  }
  try {
    return cmd.run(rest, io);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`beatforce ${cmd.name}: ${e.message}\nusage: ${cmd.usage}\n`);
      return EXIT.usage;
    }
    throw e;
  }
}
