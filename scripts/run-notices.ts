// npm run notices: today's owner notices for every program (or --program N), for a scheduler
// such as cron. Safe to run as often as you like: each notice goes out once, a run that finds
// another one sending skips, and failed sends are retried with back-off by later runs.
// Exit status: 0 all done, 1 a program's run failed or a notice could not be sent.

async function main(): Promise<number> {
  const { runNoticesForAllPrograms } = await import("@/lib/data/notices-run");
  const args = process.argv.slice(2);
  const programIndex = args.indexOf("--program");
  const programIds = programIndex >= 0 ? [Number(args[programIndex + 1])] : undefined;
  if (programIds && !programIds.every((id) => Number.isInteger(id) && id > 0)) {
    console.error("--program takes a program id (a whole number).");
    return 2;
  }
  const isQuiet = args.includes("--quiet");
  const summaries = await runNoticesForAllPrograms({ trigger: "schedule", programIds, onLog: isQuiet ? undefined : (line) => console.log(`[notices] ${line}`) });
  for (const s of summaries) {
    console.log(`[notices] ${s.programName}: ${s.status}${s.today ? ` (${s.today})` : ""}. planned ${s.planned}, recorded ${s.recorded}, e-mails ${s.messages} (sent ${s.sent}, failed ${s.failed}), letters ${s.letters}, withdrawn ${s.withdrawn}. ${s.message}`);
  }
  return summaries.some((s) => s.status === "failed") ? 1 : 0;
}

async function close(): Promise<void> {
  const { closeDb } = await import("@/db/client");
  await closeDb();
}

main()
  .then(async (code) => {
    await close();
    process.exit(code);
  })
  .catch(async (error: unknown) => {
    console.error(error);
    await close();
    process.exit(1);
  });
