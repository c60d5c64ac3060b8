// Job states as one array parameter: `j.state = any($1::job_state[])` lets PostgreSQL use the
// (shop_id, state) index, which `j.state::text in (…)` does not.
import type { JobState } from '../jobs/states';

export function stateArray(states: readonly JobState[]): string {
	return `{${states.join(',')}}`;
}
