/**
 * Commander settings shared by every command so that a typo gets a short, useful answer:
 *
 * - unknown options are reported before missing required ones (commander checks required options
 *   first, so `run s.yaml --ouput r.arrow` used to say that --output is missing). Required options are
 *   checked in a preAction hook instead, which commander runs after its unknown-option check; the
 *   message is commander's own (`error: required option '-o, --output <file>' not specified`).
 * - after a parse error a one-line pointer to the command's help is printed, not the whole help;
 *   commander adds "(Did you mean --output?)" itself for a near miss.
 */
import type { Command, Option } from 'commander';

/** The line printed after a parse error of `meltsweep NAME`. */
function helpPointer(command: Command): string {
  const names: string[] = [];
  for (let c: Command | null = command; c !== null && c.parent !== null; c = c.parent) names.unshift(c.name());
  return `(run meltsweep ${names.join(' ')} --help for its options)`;
}

/** Apply the typo-friendly settings to a command and its subcommands (call after their options are declared). */
export function checkOptionsInOrder(command: Command): void {
  for (const sub of command.commands) checkOptionsInOrder(sub.exitOverride());
  const required: Option[] = command.options.filter((o) => o.mandatory);
  for (const o of required) o.mandatory = false;
  command.showHelpAfterError(helpPointer(command)).showSuggestionAfterError(true);
  if (required.length === 0) return;
  command.hook('preAction', (cmd) => {
    for (const o of required) {
      if (cmd.getOptionValue(o.attributeName()) === undefined) cmd.error(`error: required option '${o.flags}' not specified`, { code: 'commander.missingMandatoryOptionValue' });
    }
  });
}
