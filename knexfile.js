// Knex configuration shared by the app, the migration scripts and the tests.
// The connection comes from DATABASE_URL (set by `npm start` / `npm test`, or by the operator).
const path = require("node:path");

function connectionFromEnv() {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set (npm start and npm test set it; see README).");
  const u = new URL(url);
  return {
    host: u.hostname,
    port: Number(u.port || 3306),
    user: decodeURIComponent(u.username),
    password: decodeURIComponent(u.password),
    database: u.pathname.replace(/^\//, ""),
    charset: "utf8mb4",
    timezone: "Z",
    dateStrings: false,
    decimalNumbers: true,
    supportBigNumbers: true,
    // Fail fast when the server is unreachable: every request answers 503 well within 10 s.
    connectTimeout: 3000,
  };
}

module.exports = {
  client: "mysql2",
  connection: connectionFromEnv,
  pool: { min: 0, max: Number(process.env.DATABASE_POOL_MAX || 10) },
  acquireConnectionTimeout: 4000,
  migrations: {
    directory: path.join(__dirname, "database", "migrations"),
    tableName: "knex_migrations",
    loadExtensions: [".ts"],
  },
  seeds: { directory: path.join(__dirname, "database", "seeds"), loadExtensions: [".ts"] },
};
