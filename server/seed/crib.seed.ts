import type { SeedContext } from "./seed-context";

export async function seedCrib(_ctx: SeedContext): Promise<void> {}
