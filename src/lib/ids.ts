// Ids in URLs and forms. Pure: a value PostgreSQL's uuid type would refuse must never reach a
// query (it answers with an error, which would be a 500), so routes check it and answer 404.

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Whether `v` is a UUID in its usual written form (8-4-4-4-12 hex digits). */
export function isUuid(v: string): boolean {
	return uuidPattern.test(v);
}
