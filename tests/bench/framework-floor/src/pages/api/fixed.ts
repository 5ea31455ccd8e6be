// A fixed JSON body as large as Decant's answer (FLOOR_JSON, set by http.bench.ts).
const body = process.env.FLOOR_JSON ?? "{}";

export const GET = () => new Response(body, { headers: { "content-type": "application/json" } });
