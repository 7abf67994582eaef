// `npm run job:reminders`: runs the due-reminder job once from a shell.
process.stdout.write("The reminder job is not wired yet.\n");
