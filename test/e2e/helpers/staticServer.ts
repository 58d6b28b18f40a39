/**
 * A tiny static file server for the built site (node:http, no dependencies). Serves `rootDir` under `basePath`
 * ("/" or "/tools/armdex/"), like a plain web server on a sub-path: directories answer with their index.html, a
 * directory URL without its trailing slash redirects, anything outside the base path is 404. No CSP header is sent:
 * the pages' own <meta> policy is what the tests check.
 */
import { createReadStream } from "node:fs";
import { stat } from "node:fs/promises";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { extname, join, resolve, sep } from "node:path";

const CONTENT_TYPES: Readonly<Record<string, string>> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".mjs": "text/javascript; charset=utf-8",
  ".json": "application/json; charset=utf-8",
  ".csv": "text/csv; charset=utf-8",
  ".urdf": "application/xml; charset=utf-8",
  ".txt": "text/plain; charset=utf-8",
  ".svg": "image/svg+xml",
  ".png": "image/png",
  ".ico": "image/x-icon",
  ".pdf": "application/pdf",
  ".xml": "application/xml",
  ".woff2": "font/woff2",
  ".webmanifest": "application/manifest+json",
};

export interface StaticServer {
  /** "http://127.0.0.1:<port>" */
  readonly origin: string;
  /** Normalised base path, always with leading and trailing slash. */
  readonly basePath: string;
  /** origin + basePath: the site's home page. */
  readonly siteUrl: string;
  close(): Promise<void>;
}

/** "/tools/armdex" → "/tools/armdex/"; "" → "/". */
export function normaliseBasePath(base: string | undefined): string {
  const trimmed = (base ?? "/").replace(/^\/+|\/+$/g, "");
  return trimmed ? `/${trimmed}/` : "/";
}

async function statOrNull(path: string) {
  try {
    return await stat(path);
  } catch {
    return null;
  }
}

export async function serveStatic(rootDir: string, basePath: string): Promise<StaticServer> {
  const root = resolve(rootDir);
  const base = normaliseBasePath(basePath);
  const server: Server = createServer((req, res) => {
    void (async () => {
      const send = (status: number, body: string, headers: Record<string, string> = {}) => {
        res.writeHead(status, { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store", ...headers });
        res.end(req.method === "HEAD" ? undefined : body);
      };
      if (req.method !== "GET" && req.method !== "HEAD") return send(405, "method not allowed", { allow: "GET, HEAD" });
      let pathname: string;
      try {
        pathname = decodeURIComponent(new URL(req.url ?? "/", "http://localhost").pathname);
      } catch {
        return send(400, "bad request");
      }
      if (`${pathname}/` === base) return send(301, "", { location: base });
      if (!pathname.startsWith(base)) return send(404, "not found (outside the base path)");
      const file = resolve(root, `.${sep}${pathname.slice(base.length)}`);
      if (file !== root && !file.startsWith(root + sep)) return send(404, "not found");
      let target = file;
      let info = await statOrNull(target);
      if (info?.isDirectory()) {
        if (!pathname.endsWith("/")) return send(301, "", { location: `${pathname}/` });
        target = join(file, "index.html");
        info = await statOrNull(target);
      }
      if (!info?.isFile()) {
        const notFound = join(root, "404.html");
        const nf = await statOrNull(notFound);
        if (nf?.isFile()) {
          res.writeHead(404, { "content-type": CONTENT_TYPES[".html"]!, "cache-control": "no-store" });
          if (req.method === "HEAD") return res.end();
          return createReadStream(notFound).pipe(res);
        }
        return send(404, "not found");
      }
      res.writeHead(200, {
        "content-type": CONTENT_TYPES[extname(target).toLowerCase()] ?? "application/octet-stream",
        "content-length": String(info.size),
        "cache-control": "no-store",
        "x-content-type-options": "nosniff",
      });
      if (req.method === "HEAD") return res.end();
      createReadStream(target).pipe(res);
    })().catch((e: unknown) => {
      if (!res.headersSent) res.writeHead(500, { "content-type": "text/plain; charset=utf-8" });
      res.end(String(e));
    });
  });
  await new Promise<void>((ok, fail) => {
    server.once("error", fail);
    server.listen(0, "127.0.0.1", ok);
  });
  const { port } = server.address() as AddressInfo;
  const origin = `http://127.0.0.1:${port}`;
  return {
    origin,
    basePath: base,
    siteUrl: `${origin}${base}`,
    close: () =>
      new Promise<void>((ok, fail) => {
        server.closeAllConnections();
        server.close((e) => (e ? fail(e) : ok()));
      }),
  };
}
