/** Placeholder replaced by the api platform work: runs every migration against a database URL. */
export async function migrate(_url: string): Promise<void> {}
