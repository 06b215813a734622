/**
 * A query whose shape never changes, built and compiled once: Kysely builds the operation tree,
 * runs it through the plugins (CamelCasePlugin) and writes the SQL on every call, which for the
 * large reads of every request (who is calling, the episode, its gate materials) costs more CPU
 * than running them. `compiledOnce` builds the query with a placeholder for each named value,
 * compiles it on first use, and afterwards only puts the values in the placeholders' parameter
 * slots. Results still pass through the plugins (executeQuery applies transformResult), and the
 * query counting of db/query-count.ts still sees every run.
 *
 * Only scalar values may be named (an id, a date): a list would change the SQL's shape.
 */
import { CompiledQuery, type Compilable, type QueryResult } from 'kysely';
import type { Executor } from '../episodes/episodes';
import { statementName } from './prepared-statements';

const PLACEHOLDER = '\u0000compiled-once:';

interface Template {
	sql: string;
	/** Per parameter: the name of the value it takes, or the constant the query was built with. */
	slots: ({ name: string } | { constant: unknown })[];
	query: CompiledQuery;
}

export function compiledOnce<Name extends string, Row>(
	names: readonly Name[],
	build: (values: Record<Name, string>) => Compilable<Row>
) {
	let template: Template | null = null;

	function compile(): Template {
		const placeholders = Object.fromEntries(
			names.map((name) => [name, `${PLACEHOLDER}${name}`])
		) as Record<Name, string>;
		const query = build(placeholders).compile();
		const seen = new Set<string>();
		const slots = query.parameters.map((parameter) => {
			if (typeof parameter === 'string' && parameter.startsWith(PLACEHOLDER)) {
				const name = parameter.slice(PLACEHOLDER.length);
				seen.add(name);
				return { name };
			}
			if (typeof parameter === 'string' && parameter.includes(PLACEHOLDER))
				throw new Error(`compiledOnce: a named value was changed before it reached the SQL`);
			return { constant: parameter };
		});
		for (const name of names)
			if (!seen.has(name)) throw new Error(`compiledOnce: the query never uses “${name}”`);
		// Sent as a named prepared statement: parsed once per connection (prepared-statements.ts).
		statementName(query.sql);
		return { sql: query.sql, slots, query };
	}

	/** Runs the query with these values on the executor (the app's db or a transaction). */
	return async function run(
		executor: Executor,
		values: Record<Name, unknown>
	): Promise<QueryResult<Row>> {
		template ??= compile();
		const parameters = template.slots.map((slot) =>
			'name' in slot ? values[slot.name as Name] : slot.constant
		);
		return executor.executeQuery<Row>(
			CompiledQuery.raw(template.sql, parameters) as CompiledQuery<Row>
		);
	};
}
