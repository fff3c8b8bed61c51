// Replaced by the database set-up; kept minimal so pure tests run.
export async function setup(): Promise<void> {}
export async function teardown(): Promise<void> {}
