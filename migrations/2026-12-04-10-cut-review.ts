import { sql, type Kysely } from 'kysely';

/**
 * Cut review: numbered versions of the cut, timecoded comments on them, and the producer's answer.
 *
 * - `upload.change_note`: the note typed with a cut upload, until it becomes a version.
 * - `cut_version`: one row per cut upload (footage with purpose `cut`), numbered 1, 2, … per
 *   episode, with the editor's change note and the producer's answer (`approval`: waiting,
 *   approved, changes asked with a note). `carry_offset_frames` is the shift the editor confirmed
 *   for the comments carried into this version (0: same programme time).
 * - `cut_comment`: a comment at a frame (or over a range, end exclusive) of the version it sits
 *   on now. Open comments move to each new version; `carried_from` is the number of the version
 *   it last came from and `source_start_frame`/`source_end_frame` its frames there, so an offset
 *   confirmed again replaces the last one rather than adding to it.
 *   `state`: open, resolved, or wont_change with a required reason.
 * - `cut_comment_reply`: the editor's (or anyone's) answers under a comment.
 *
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	// The change note typed in the upload form, kept until the upload finishes and becomes a version.
	await db.schema
		.alterTable('upload')
		.addColumn('change_note', 'text', (c) =>
			c
				.notNull()
				.defaultTo('')
				.check(sql`length(change_note) <= 2000`)
		)
		.execute();
	await db.schema
		.createTable('cut_version')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('footage_id', 'uuid', (c) =>
			c.notNull().unique().references('footage.id').onDelete('cascade')
		)
		.addColumn('number', 'integer', (c) => c.notNull().check(sql`number >= 1`))
		.addColumn('change_note', 'text', (c) =>
			c
				.notNull()
				.defaultTo('')
				.check(sql`length(change_note) <= 2000`)
		)
		.addColumn('approval', 'text', (c) =>
			c
				.notNull()
				.defaultTo('waiting')
				.check(sql`approval IN ('waiting', 'approved', 'changes')`)
		)
		.addColumn('approval_note', 'text', (c) => c.check(sql`length(approval_note) <= 2000`))
		.addColumn('approved_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('approved_at', 'timestamptz')
		.addColumn('carry_offset_frames', 'integer', (c) => c.notNull().defaultTo(0))
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addUniqueConstraint('cut_version_episode_number', ['episode_id', 'number'])
		.execute();
	await db.schema
		.createIndex('cut_version_approved_by')
		.on('cut_version')
		.column('approved_by')
		.execute();

	await db.schema
		.createTable('cut_comment')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('cut_version_id', 'uuid', (c) =>
			c.notNull().references('cut_version.id').onDelete('cascade')
		)
		.addColumn('start_frame', 'integer', (c) => c.notNull().check(sql`start_frame >= 0`))
		.addColumn('end_frame', 'integer')
		.addColumn('body', 'text', (c) => c.notNull().check(sql`length(body) BETWEEN 1 AND 4000`))
		.addColumn('author_id', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('state', 'text', (c) =>
			c
				.notNull()
				.defaultTo('open')
				.check(sql`state IN ('open', 'resolved', 'wont_change')`)
		)
		.addColumn('state_reason', 'text', (c) => c.check(sql`length(state_reason) <= 2000`))
		.addColumn('state_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('state_at', 'timestamptz')
		.addColumn('carried_from', 'integer')
		.addColumn('source_start_frame', 'integer')
		.addColumn('source_end_frame', 'integer')
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addCheckConstraint('cut_comment_range', sql`end_frame IS NULL OR end_frame > start_frame`)
		.addCheckConstraint(
			'cut_comment_wont_change_reason',
			sql`state <> 'wont_change' OR length(trim(state_reason)) > 0`
		)
		.execute();
	await db.schema
		.createIndex('cut_comment_episode')
		.on('cut_comment')
		.columns(['episode_id', 'start_frame'])
		.execute();
	await db.schema
		.createIndex('cut_comment_version')
		.on('cut_comment')
		.column('cut_version_id')
		.execute();
	await db.schema.createIndex('cut_comment_author').on('cut_comment').column('author_id').execute();
	await db.schema
		.createIndex('cut_comment_state_by')
		.on('cut_comment')
		.column('state_by')
		.execute();

	await db.schema
		.createTable('cut_comment_reply')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('comment_id', 'uuid', (c) =>
			c.notNull().references('cut_comment.id').onDelete('cascade')
		)
		.addColumn('author_id', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('body', 'text', (c) => c.notNull().check(sql`length(body) BETWEEN 1 AND 4000`))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('cut_comment_reply_comment')
		.on('cut_comment_reply')
		.columns(['comment_id', 'created_at'])
		.execute();
	await db.schema
		.createIndex('cut_comment_reply_author')
		.on('cut_comment_reply')
		.column('author_id')
		.execute();

	// Existing cut uploads become versions in upload order, so nothing already uploaded is lost.
	await sql`
		INSERT INTO cut_version (episode_id, footage_id, number, created_at)
		SELECT episode_id, id, row_number() OVER (PARTITION BY episode_id ORDER BY created_at, id), created_at
		FROM footage WHERE purpose = 'cut'
	`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('cut_comment_reply').execute();
	await db.schema.dropTable('cut_comment').execute();
	await db.schema.dropTable('cut_version').execute();
	await db.schema.alterTable('upload').dropColumn('change_note').execute();
}
