import type { SeedContext } from "./seed-context";

export async function seedRegister(_ctx: SeedContext): Promise<void> {}
