import type { SeedContext } from "./seed-context";

export async function seedInvestigations(_ctx: SeedContext): Promise<void> {}
