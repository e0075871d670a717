/** Native apps keep no service-worker copies; nothing to clear. */
export async function keepOfflineCopiesFor(_session: { user: { id: number }; workspace: { id: number } | null } | null): Promise<void> {}
