/** A JSON reply as the API sends it, for tests that stand in for `fetch`. */
export const json = (body: unknown, status = 200) => new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
