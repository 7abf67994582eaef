// The floor of the benchmark: bare Express 5 + node-postgres, one indexed lookup of a tool by asset tag.
import express from "express";
import pg from "pg";

const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: Number(process.env.POOL_MAX ?? 10) });
const app = express();
app.get("/floor/tools/:tag", async (req, res) => {
  const { rows } = await pool.query("select id, asset_tag, description, serial_number, interval_days from tools where asset_tag = $1", [req.params.tag]);
  if (!rows[0]) return res.status(404).json({ error: "not found" });
  res.json(rows[0]);
});
const server = app.listen(Number(process.env.PORT ?? 0), "127.0.0.1", () => process.send?.({ port: server.address().port }));
