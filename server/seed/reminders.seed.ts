import type { SeedContext } from "./seed-context";

export async function seedReminders(_ctx: SeedContext): Promise<void> {}
