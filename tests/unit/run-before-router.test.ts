import { describe, expect, it } from "vitest";
import express, { type ErrorRequestHandler } from "express";
import request from "supertest";
import { runBeforeRouter } from "../../server/http/quick-get";

// The quick path runs before Express's router (server/http/quick-get.ts runBeforeRouter). Whatever it does not take
// must reach the routes exactly as before, and a fault inside it must end as an error answer, never as a crash of the
// server's process. Common practice, no source: what any Express middleware owes (Express's own routing guide).
function appWith(front: express.RequestHandler) {
  const app = express();
  const onError: ErrorRequestHandler = (err, _req, res, _next) => void res.status(500).json({ error: { code: "internal_error", message: String((err as Error).message) } });
  runBeforeRouter(app, front, onError);
  app.get("/api/things/:id", (req, res) => void res.json({ id: req.params.id, originalUrl: req.originalUrl, baseUrl: req.baseUrl }));
  app.use(onError);
  return app;
}

describe("the quick path before the router", () => {
  it("a request it passes on reaches its route with Express's request as the route would have had it", async () => {
    const app = appWith((_req, _res, next) => next());
    const res = await request(app).get("/api/things/7?x=1");
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ id: "7", originalUrl: "/api/things/7?x=1", baseUrl: "" });
  });

  it("a request it answers never reaches the router, and has Express's answer methods", async () => {
    const app = appWith((req, res) => void res.status(202).json({ taken: req.path }));
    const res = await request(app).get("/api/things/7");
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ taken: "/api/things/7" });
  });

  it("a throw inside it, or an error it passes on, is an error answer and the server keeps answering", async () => {
    let calls = 0;
    const app = appWith((_req, _res, next) => {
      calls++;
      if (calls === 1) throw new Error("thrown before any answer");
      if (calls === 2) return next(new Error("passed on"));
      next();
    });
    const thrown = await request(app).get("/api/things/1");
    expect(thrown.status).toBe(500);
    expect(thrown.body.error.message).toBe("thrown before any answer");
    const passed = await request(app).get("/api/things/2");
    expect(passed.status).toBe(500);
    expect(passed.body.error.message).toBe("passed on");
    expect((await request(app).get("/api/things/3")).body.id).toBe("3");
  });

  it("an asynchronous one that fails is an error answer too, never an unhandled rejection", async () => {
    let calls = 0;
    const app = appWith(async (_req, _res, next) => {
      calls++;
      await Promise.resolve();
      if (calls === 1) throw new Error("failed after a wait");
      next();
    });
    const failed = await request(app).get("/api/things/1");
    expect(failed.status).toBe(500);
    expect(failed.body.error.message).toBe("failed after a wait");
    expect((await request(app).get("/api/things/2")).body.id).toBe("2");
  });
});
