import { Command } from 'commander';
import { formatOption } from './options.ts';

// `weir audit <verb>`: for auditors. More verbs (an export of the change log) fit here.
export function auditCommand(): Command {
  const audit = new Command('audit').description('for auditors: the change log on the server');
  audit.addCommand(new Command('verify')
    .description('check that the change log has not been altered (exit 1 when its hash chain is broken)')
    .addOption(formatOption())
    .action(async (options: Record<string, unknown>, cmd: Command) => {
      const { runAuditVerify } = await import('../actions/audit.ts');
      await runAuditVerify({ ...cmd.optsWithGlobals(), ...options });
    }));
  return audit;
}
