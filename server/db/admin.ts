import pg from 'pg';

/**
 * Creates database `name` if it does not exist (optionally as a copy of `template`). Used by the
 * lifecycle scripts and tests with the cluster's superuser URL.
 */
export async function ensureDatabase(adminUrl: string, name: string, template?: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    const { rowCount } = await client.query('select 1 from pg_database where datname = $1', [name]);
    if (!rowCount) {
      const ident = (s: string) => `"${s.replace(/"/g, '""')}"`;
      await client.query(`create database ${ident(name)}${template ? ` template ${ident(template)}` : ''}`);
    }
  } finally {
    await client.end();
  }
}
