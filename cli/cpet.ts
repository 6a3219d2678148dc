import { Command, CommanderError } from "commander";
import { registerAccount } from "./account";
import { registerAnalyse } from "./analyse";
import { registerAudit } from "./audit";
import { registerPredict } from "./predict";
import { UsageError } from "./usageError";

/**
 * The `cpet` command line. stdout carries only the requested output (JSON or a table);
 * problems go to stderr as plain messages, never stack traces, with a non-zero exit.
 */
export function buildProgram(): Command {
  const program = new Command();
  program
    .name("cpet")
    .description(
      "cpet-desk: analyse cardiopulmonary exercise tests (decision support; results must be reviewed by a qualified clinician)",
    )
    // a usage error is one line plus a pointer to the help, not the whole help text
    .showHelpAfterError("(run 'cpet <command> --help' to see the options)")
    .configureOutput({ outputError: (text, write) => write(`cpet: ${text}`) })
    .exitOverride();
  registerAnalyse(program);
  registerPredict(program);
  registerAccount(program);
  registerAudit(program);
  return program;
}

async function main(argv: string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
    return 0;
  } catch (err) {
    if (err instanceof CommanderError) return err.exitCode === 0 ? 0 : 2;
    const message = err instanceof Error ? err.message : String(err);
    process.stderr.write(`cpet: ${message}\n`);
    // 2: the command is wrong (as for commander's own usage errors); 1: a file cannot be read or used
    return err instanceof UsageError ? 2 : 1;
  }
}

if (process.env.CPET_CLI_NO_MAIN !== "1") {
  main(process.argv).then((code) => {
    process.exitCode = code;
  });
}
