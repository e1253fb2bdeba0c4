// Runs tests/perf/duckdb_cohort.sql with DuckDB's Node client on the CSV files of a data
// set and prints the result as CSV: the reference for tests/perf/compare.sh. For people
// measuring; the client is installed outside the repository (npm install @duckdb/node-api
// in MODULES).
//
//   node tests/perf/duckdb_cohort.cjs --modules MODULES --data DIR --from D1 --to D2 [--threads N]
'use strict';
const fs = require('fs');
const path = require('path');

function Arguments(argv) {
  const args = { threads: '2' };
  for (let i = 0; i < argv.length; i += 2) {
    const name = argv[i].replace(/^--/, '');
    if (!['modules', 'data', 'from', 'to', 'threads'].includes(name) || argv[i + 1] === undefined) {
      throw new Error(`duckdb_cohort: unknown or incomplete argument ${argv[i]}`);
    }
    args[name] = argv[i + 1];
  }
  for (const name of ['modules', 'data', 'from', 'to']) {
    if (!args[name]) throw new Error(`duckdb_cohort: --${name} is required`);
  }
  for (const name of ['from', 'to']) {
    if (!/^\d{4}-\d{2}-\d{2}$/.test(args[name])) throw new Error(`duckdb_cohort: --${name} is not YYYY-MM-DD`);
  }
  if (!/^\d+$/.test(args.threads)) throw new Error('duckdb_cohort: --threads is not a number');
  return args;
}

// A SQL string literal.
function Quoted(text) {
  return `'${String(text).replace(/'/g, "''")}'`;
}

async function Main() {
  const args = Arguments(process.argv.slice(2));
  const duckdb = require(require.resolve('@duckdb/node-api', { paths: [args.modules] }));
  const sql = fs.readFileSync(path.join(__dirname, 'duckdb_cohort.sql'), 'utf8')
    .replaceAll('{DISPENSING}', Quoted(path.join(args.data, 'dispensing.csv')))
    .replaceAll('{PATIENTS}', Quoted(path.join(args.data, 'patients.csv')))
    .replaceAll('{FROM_MONTH}', Quoted(args.from.slice(0, 8) + '01'))
    .replaceAll('{TO}', Quoted(args.to));
  const instance = await duckdb.DuckDBInstance.create(':memory:', { threads: args.threads });
  const connection = await instance.connect();
  const reader = await connection.runAndReadAll(sql);
  const lines = [reader.columnNames().join(',')];
  for (const row of reader.getRows()) lines.push(row.map((value) => String(value)).join(','));
  process.stdout.write(lines.join('\n') + '\n');
}

Main().catch((error) => {
  process.stderr.write(`${error.message}\n`);
  process.exit(2);
});
