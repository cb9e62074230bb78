// Registers invented compounds under given registry IDs for tests (filled in once the compound
// registry service exists).
export async function registerDemoCompoundsFor(_ids: string[]): Promise<void> {}
