// Rollups and retention: the periodic jobs of the ingest worker.
import { sql } from 'drizzle-orm';
import { db } from '..';

/**
 * Recomputes up to `limit` 15-minute buckets that received readings, and the hours they belong
 * to. Only buckets that have closed (their end more than a minute ago) are taken, so each is
 * normally computed once; recent charts read raw readings anyway. SKIP LOCKED lets several
 * workers share the queue. Returns how many 15-minute buckets were written.
 */
export async function refreshRollups(limit = 5000): Promise<number> {
  return db().transaction(async (tx) => {
    const done = await tx.execute<{ tank_id: string; hour: string; n: number }>(sql`
      with d as (
        delete from rollup_dirty where (tank_id, bucket) in (
          select tank_id, bucket from rollup_dirty
          where bucket < now() - interval '16 minutes'
          order by bucket limit ${limit} for update skip locked)
        returning tank_id, bucket
      ), r as (
        select d.bucket, x.* from d
        join readings x on x.tank_id = d.tank_id and x.ts >= d.bucket and x.ts < d.bucket + interval '15 minutes'
      ), per_layer as (
        select r.tank_id, r.bucket, u.i, round(avg(u.v))::smallint as v
        from r cross join lateral unnest(r.layers_cc) with ordinality as u(v, i)
        group by 1, 2, 3
      ), layers as (
        select tank_id, bucket, array_agg(v order by i) as layers from per_layer group by 1, 2
      ), stats as (
        select tank_id, bucket, count(*)::int as samples,
          min(layers_cc[array_length(layers_cc, 1)]) as top_min, max(layers_cc[array_length(layers_cc, 1)]) as top_max,
          round(avg(flow_cc))::smallint as flow_avg,
          (count(*) filter (where compressor))::int as comp, (count(*) filter (where immersion_w > 0))::int as imm,
          avg(power_w)::real as power_avg, (avg(draw_dlpm) / 10)::real as draw_avg
        from r group by 1, 2
      ), up as (
        insert into rollups_15m (tank_id, bucket, samples, layers_avg_cc, top_min_cc, top_max_cc, flow_avg_cc,
          compressor_samples, immersion_samples, power_avg_w, draw_avg_lpm)
        select s.tank_id, s.bucket, s.samples, l.layers, s.top_min, s.top_max, s.flow_avg, s.comp, s.imm, s.power_avg, s.draw_avg
        from stats s join layers l using (tank_id, bucket)
        on conflict (tank_id, bucket) do update set samples = excluded.samples, layers_avg_cc = excluded.layers_avg_cc,
          top_min_cc = excluded.top_min_cc, top_max_cc = excluded.top_max_cc, flow_avg_cc = excluded.flow_avg_cc,
          compressor_samples = excluded.compressor_samples, immersion_samples = excluded.immersion_samples,
          power_avg_w = excluded.power_avg_w, draw_avg_lpm = excluded.draw_avg_lpm
        returning tank_id, bucket
      )
      select tank_id, date_trunc('hour', bucket) as hour, count(*)::int as n from up group by 1, 2`);
    if (done.rows.length === 0) return 0;
    const hours = JSON.stringify(done.rows.map((r) => ({ tank_id: r.tank_id, hour: r.hour })));
    // Hourly from the (now updated) 15-minute rows, weighted by their sample counts.
    await tx.execute(sql`
      with h as (select * from json_to_recordset(${hours}::json) as x(tank_id uuid, hour timestamptz)),
      q as (
        select q.* from h join rollups_15m q on q.tank_id = h.tank_id and q.bucket >= h.hour and q.bucket < h.hour + interval '1 hour'
      ), per_layer as (
        select q.tank_id, date_trunc('hour', q.bucket) as hour, u.i, round(sum(u.v::int * q.samples)::numeric / nullif(sum(q.samples) filter (where u.v is not null), 0))::smallint as v
        from q cross join lateral unnest(q.layers_avg_cc) with ordinality as u(v, i)
        group by 1, 2, 3
      ), layers as (select tank_id, hour, array_agg(v order by i) as layers from per_layer group by 1, 2),
      stats as (
        select tank_id, date_trunc('hour', bucket) as hour, sum(samples)::int as samples, min(top_min_cc) as top_min, max(top_max_cc) as top_max,
          round(sum(flow_avg_cc::int * samples)::numeric / nullif(sum(samples) filter (where flow_avg_cc is not null), 0))::smallint as flow_avg,
          sum(compressor_samples)::int as comp, sum(immersion_samples)::int as imm,
          (sum(power_avg_w * samples) / nullif(sum(samples) filter (where power_avg_w is not null), 0))::real as power_avg,
          (sum(draw_avg_lpm * samples) / nullif(sum(samples) filter (where draw_avg_lpm is not null), 0))::real as draw_avg
        from q group by 1, 2
      )
      insert into rollups_1h (tank_id, bucket, samples, layers_avg_cc, top_min_cc, top_max_cc, flow_avg_cc,
        compressor_samples, immersion_samples, power_avg_w, draw_avg_lpm)
      select s.tank_id, s.hour, s.samples, l.layers, s.top_min, s.top_max, s.flow_avg, s.comp, s.imm, s.power_avg, s.draw_avg
      from stats s join layers l using (tank_id, hour)
      on conflict (tank_id, bucket) do update set samples = excluded.samples, layers_avg_cc = excluded.layers_avg_cc,
        top_min_cc = excluded.top_min_cc, top_max_cc = excluded.top_max_cc, flow_avg_cc = excluded.flow_avg_cc,
        compressor_samples = excluded.compressor_samples, immersion_samples = excluded.immersion_samples,
        power_avg_w = excluded.power_avg_w, draw_avg_lpm = excluded.draw_avg_lpm`);
    return done.rows.reduce((sum, r) => sum + Number(r.n), 0);
  });
}

/**
 * Sets how long pg_partman keeps daily reading partitions, and makes sure every day of that window
 * has its partition: ingest accepts readings that old (a device's backlog, an import), and without
 * its own partition a day's readings would fall into the default partition, which is slower to
 * write and blocks creating that day's partition later. Readings already in the default partition
 * are moved into their days first.
 */
export async function setReadingsRetention(days: number): Promise<void> {
  await db().execute(
    sql`update partman.part_config set retention = ${`${days} days`}, retention_keep_table = false where parent_table = 'public.readings'`,
  );
  await db().execute(sql`select partman.partition_data_time('public.readings', p_batch_count => ${days + 8})`);
  await db().execute(sql`select partman.create_partition_time('public.readings', array(
    select generate_series(date_trunc('day', now()) - make_interval(days => ${days}), date_trunc('day', now()), interval '1 day')))`);
}

/**
 * Premakes partitions and drops those past retention (pg_partman's background worker does the
 * same hourly), and deletes rollups and dead letters past theirs.
 */
export async function runRetention(opts: { rollupDays: number; deadLetterDays: number }): Promise<void> {
  await db().execute(sql`select partman.run_maintenance(p_parent_table => 'public.readings')`);
  await db().execute(sql`delete from rollups_15m where bucket < now() - make_interval(days => ${opts.rollupDays})`);
  await db().execute(sql`delete from rollups_1h where bucket < now() - make_interval(days => ${opts.rollupDays})`);
  await db().execute(
    sql`delete from dead_letters where received_at < now() - make_interval(days => ${opts.deadLetterDays})`,
  );
}
