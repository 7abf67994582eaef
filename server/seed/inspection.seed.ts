import type { SeedContext } from "./seed-context";

export async function seedInspection(_ctx: SeedContext): Promise<void> {}
