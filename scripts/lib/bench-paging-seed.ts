/**
 * Data at a real channel's size for the paging benches (scripts/bench-paging.ts): a channel of its
 * own with a producer who holds every role (signed in with the demo password), then as many
 * episodes, catalogue parts or chapters as a bench asks for. Fictional names throughout. Kept
 * apart from any shared bench seed so the benches can later point at one without changing.
 */
import type pg from 'pg';

/** A channel and its producer (every role); the producer signs in with the demo password. */
export async function benchChannel(
	pool: pg.Pool,
	name: string,
	email: string
): Promise<{ channelId: string; personId: string }> {
	const channel = await pool.query<{ id: string }>(
		`INSERT INTO channel (name, frame_rate) VALUES ($1, '29.97') RETURNING id`,
		[name]
	);
	const person = await pool.query<{ id: string }>(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, 'Bench Producer', password_hash FROM person WHERE email = 'dana@torquehaven.test'
		 RETURNING id`,
		[email]
	);
	await pool.query(
		`INSERT INTO membership (channel_id, person_id, roles)
		 VALUES ($1, $2, ARRAY['producer','host','camera','editor','merch'])`,
		[channel.rows[0].id, person.rows[0].id]
	);
	return { channelId: channel.rows[0].id, personId: person.rows[0].id };
}

/** `count` episodes spread over stages and dates (a fifth without a date), each with 4 segments and a host. */
export async function addEpisodes(
	pool: pg.Pool,
	channelId: string,
	personId: string,
	count: number
): Promise<void> {
	await pool.query(
		`INSERT INTO episode (channel_id, title, slug, logline, target_runtime_seconds, frame_rate, stage, publish_date)
		 SELECT $1,
		   (ARRAY['Rear lift block swap','Coil spacer install','Brake line refresh','Track bar relocation','Shackle flip'])[1 + i % 5] || ' no. ' || i,
		   'bench-episode-' || i, 'A day in the bay on a fictional pickup.', 900, '29.97',
		   (ARRAY['script','shoot','edit','locked','published'])[1 + i % 5],
		   CASE WHEN i % 5 = 0 THEN NULL ELSE DATE '2027-01-01' + (i % 700) END
		 FROM generate_series(1, ${count}) AS i`,
		[channelId]
	);
	await pool.query(
		`INSERT INTO segment (episode_id, position, kind, title, planned_seconds)
		 SELECT e.id, p, 'install-step', 'Step ' || p, 120 FROM episode e, generate_series(1, 4) AS p
		 WHERE e.channel_id = $1`,
		[channelId]
	);
	await pool.query(
		`INSERT INTO episode_assignment (episode_id, role, person_id)
		 SELECT e.id, 'host', $2 FROM episode e WHERE e.channel_id = $1`,
		[channelId, personId]
	);
	await pool.query('ANALYZE episode; ANALYZE segment; ANALYZE episode_assignment');
}

/**
 * `count` catalogue parts of fictional brands, varied so words, SKUs and filters select
 * differently; SKUs start with `prefix` (npm run bench:seed uses its own, so the two never clash).
 */
export async function addParts(
	pool: pg.Pool,
	channelId: string,
	count: number,
	prefix = 'BN'
): Promise<void> {
	await pool.query(
		`INSERT INTO part (channel_id, sku, name, category, brand, price_cents, currency, store_url, fitment_note, status)
		 SELECT $1,
		   '${prefix}-' || (ARRAY['LB','CS','SS','UB','SHK','AAL','BL','TB','PA','SBL'])[1 + i % 10] || '-' || lpad(i::text, 6, '0'),
		   (ARRAY['Lift block pair','Coil spacer pair','Strut spacer pair','U-bolt kit','Shackle pair','Add-a-leaf','Brake line set','Track bar','Pitman arm','Sway bar link pair'])[1 + i % 10]
		     || ', ' || (1 + i % 6) || ' in, ' || (ARRAY['cast','forged','polyurethane','aluminium','steel','zinc plated','heavy duty'])[1 + (i / 10) % 7] || ' ' || i,
		   (ARRAY['Lift blocks','Coil spacers','Strut spacers','U-bolts','Shackles','Leaf springs','Brake lines','Steering','Steering','Sway bars'])[1 + i % 10],
		   (ARRAY['Kingbolt Suspension','Quillon Shocks','Halvard Wheel Co.','Cindertrack Tyres','Northpine Brake Works','Cobalt Steer','Ashgrove Axle Works','Tallow Ridge Offroad','Mirefield Fabrication','Kestrelmark Lift','Brackwater Gear','Saltmarsh Steelworks'])[1 + (i / 7) % 12],
		   1000 + (i * 7919) % 90000, 'USD', 'https://shop.bench.test/p/' || i, '',
		   CASE WHEN i % 50 = 0 THEN 'discontinued' WHEN i % 20 = 0 THEN 'out_of_stock' ELSE 'active' END
		 FROM generate_series(1, ${count}) AS i`,
		[channelId]
	);
	await pool.query('ANALYZE part');
}

/**
 * An episode in the edit with a script of ten segments that names a few parts by SKU and one by
 * name (about 1,500 characters each), for the "named in the script" check of featured parts.
 */
export async function addScriptedEpisode(pool: pg.Pool, channelId: string): Promise<string> {
	const episode = await pool.query<{ id: string }>(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, 'Bench: parts on the bench', 'bench-parts-on-the-bench', 3600, '29.97', 'edit', 107892) RETURNING id`,
		[channelId]
	);
	const id = episode.rows[0].id;
	await pool.query(
		`INSERT INTO segment (episode_id, position, kind, title) SELECT $1, i, 'install-step', 'Step ' || i FROM generate_series(1, 10) AS i`,
		[id]
	);
	await pool.query(
		`INSERT INTO segment_script (segment_id, body)
		 SELECT s.id, repeat('Lower the axle onto the stands, check the pinion angle number ' || s.position || ' and torque the nuts in a cross pattern. ', 15)
		   || ' Fit the BN-LB-' || lpad((s.position * 10)::text, 6, '0') || ' block, then the Track bar, 2 in, cast 7.'
		 FROM segment s WHERE s.episode_id = $1`,
		[id]
	);
	return id;
}

/** An episode whose cut holds `count` chapters, one every 12 s (the rules ask for at least 10 s). */
export async function addChapteredEpisode(
	pool: pg.Pool,
	channelId: string,
	count: number
): Promise<string> {
	// 12 s at 29.97 is 359.64 frames: rounded per chapter from the exact rate 30000/1001.
	const episode = await pool.query<{ id: string }>(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, $2, $3, 12000, '29.97', 'edit', round(($4::bigint * 12 + 15) * 30000 / 1001.0)::int) RETURNING id`,
		[channelId, `Bench: ${count} chapters`, `bench-chapters-${count}`, count]
	);
	const id = episode.rows[0].id;
	await pool.query(
		`INSERT INTO chapter (episode_id, start_frame, title)
		 SELECT $1, round(i::bigint * 12 * 30000 / 1001.0)::int, (i + 1) || '. ' || (ARRAY['Loosen the U-bolts','Torque = 95 ft·lbf; step #3','Bleed the brakes','<b>Shackle</b> flip & re-torque'])[1 + i % 4]
		 FROM generate_series(0, $2::int - 1) AS i`,
		[id, count]
	);
	// As the other bench data does (and autovacuum would within a minute): the planner's counts.
	await pool.query('ANALYZE chapter');
	return id;
}

/**
 * An episode with `count` footage rows (clip names, cameras and lengths repeating, so sorts tie)
 * and `count` segment notes over 10 segments (program times in runs of 20, every tenth unplaced).
 */
export async function addLoggedEpisode(
	pool: pg.Pool,
	channelId: string,
	personId: string,
	count: number
): Promise<string> {
	const episode = await pool.query<{ id: string }>(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage)
		 VALUES ($1, $2, $3, 3600, '29.97', 'edit') RETURNING id`,
		[channelId, `Bench: ${count} clips and notes`, `bench-logged-${count}`]
	);
	const id = episode.rows[0].id;
	await pool.query(
		`INSERT INTO segment (episode_id, position, kind, title) SELECT $1, i, 'install-step', 'Step ' || i FROM generate_series(1, 10) AS i`,
		[id]
	);
	await pool.query(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, camera_label, clip_name, file_name,
		   file_type, size_bytes, sha256, duration_seconds, uploaded_by, created_at)
		 SELECT $1, $2, 'bench-clip-' || i, 'footage', (ARRAY['A cam','B cam','Lift cam'])[1 + i % 3],
		   'BC_' || lpad((i % 2000)::text, 4, '0'), 'BC_' || i || '.mov', 'video/quicktime',
		   50000000 + (i % 97) * 1000000, repeat('0', 64), CASE WHEN i % 11 = 0 THEN NULL ELSE 5 + (i % 300) * 0.5 END,
		   $3, now() - i * interval '1 minute'
		 FROM generate_series(1, ${count}) AS i`,
		[channelId, id, personId]
	);
	await pool.query(
		`INSERT INTO segment_note (episode_id, segment_id, program_frame, text, author_id)
		 SELECT $1, (SELECT s.id FROM segment s WHERE s.episode_id = $1 AND s.position = 1 + i % 10),
		   CASE WHEN i % 10 = 0 THEN NULL ELSE (i / 20) * 30 END, 'Bench note ' || i, $2
		 FROM generate_series(1, ${count}) AS i`,
		[id, personId]
	);
	await pool.query('ANALYZE footage; ANALYZE segment_note; ANALYZE segment');
	return id;
}
