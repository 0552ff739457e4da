import type { FastifyInstance, FastifyReply } from "fastify";
import * as contracts from "../contracts/service.js";
import { escapeHtml } from "../../report/escape.js";
import { notFound, PROBLEM_BASE, ProblemError } from "../problem.js";
import { isProblemSlug, PROBLEM_TYPES, type ProblemSlug } from "../problem-types.js";

/**
 * GET /problems/<slug>: what a problem type means and what to do, as a short HTML page a person can open from the
 * `type` of an answer; GET /problems lists them all. Open (no key) and static; the API's security headers apply.
 */

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} · pfc-sizing</title>
</head>
<body>
<main>
${body}
</main>
</body>
</html>
`;
}

export function problemTypePage(slug: ProblemSlug): string {
  const t = PROBLEM_TYPES[slug];
  return page(
    t.title,
    `<h1>${escapeHtml(t.title)}</h1>
<p>HTTP status ${escapeHtml(t.status)} · problem type <code>${escapeHtml(PROBLEM_BASE + slug)}</code></p>
<h2>What it means</h2>
<p>${escapeHtml(t.means)}</p>
<h2>What to do</h2>
<p>${escapeHtml(t.todo)}</p>
<p>The answer itself says more: <code>detail</code> tells what went wrong with that request and <code>errors</code>, when
present, names each field by its path. When you report a problem, quote the answer's <code>x-request-id</code> header.</p>
<p><a href="${PROBLEM_BASE.slice(0, -1)}">Every problem type</a></p>`,
  );
}

export function problemIndexPage(): string {
  const items = (Object.keys(PROBLEM_TYPES) as ProblemSlug[])
    .map(
      (slug) => `<li><a href="${PROBLEM_BASE}${slug}">${escapeHtml(PROBLEM_TYPES[slug].title)}</a> (${escapeHtml(PROBLEM_TYPES[slug].status)})</li>`,
    )
    .join("\n");
  return page(
    "Problem types",
    `<h1>Problem types</h1>\n<p>Every error answer of the API is a problem (RFC 9457) whose <code>type</code> is one of these pages.</p>\n<ul>\n${items}\n</ul>`,
  );
}

const sendPage = (reply: FastifyReply, html: string) =>
  reply.type("text/html; charset=utf-8").header("cache-control", "public, max-age=3600").send(html);

export async function problemsRoutes(app: FastifyInstance): Promise<void> {
  app.get("/problems", { schema: contracts.problemTypes }, async (_request, reply) => sendPage(reply, problemIndexPage()));
  app.get<{ Params: { type: string } }>("/problems/:type", { schema: contracts.problemType }, async (request, reply) => {
    const { type } = request.params;
    if (!isProblemSlug(type)) throw new ProblemError(notFound(`problem type ${JSON.stringify(type)}`));
    return sendPage(reply, problemTypePage(type));
  });
}
