/**
 * The security headers every answer carries, set by helmet, in two profiles:
 *
 * - The dashboard's documents get a strict Content Security Policy: scripts, styles, fonts,
 *   images and requests from this origin only, no inline script in any form, no inline style
 *   attribute, no <base> tricks, never framed. What the built dashboard needs under it is proven
 *   in Chromium (tests/security/headers.test.ts): Vite emits external module scripts and one
 *   stylesheet, the fonts are self-hosted, React and recharts set styles through the CSSOM
 *   (element.style), which style-src does not govern. `object-src 'self'` is for the one plugin
 *   content the dashboard shows, its own invoice PDF in an <object>.
 * - API answers (JSON, and the PDFs) may be framed by the dashboard itself and nothing else. They
 *   get no resource policy: JSON goes out as application/json with nosniff and is never rendered
 *   as a page, and Chrome's PDF viewer does not work under one (object-src and style rules block
 *   its own viewer page, crbug.com/271452).
 *
 * `upgrade-insecure-requests` (a helmet default) is left out on purpose: Vanbay is reached over
 * plain http on the van's own network (http://192.168.x.x:5180), where it would break every
 * request the page makes.
 */
import type { RequestHandler } from 'express';
import helmet from 'helmet';

export const DASHBOARD_CSP: Readonly<Record<string, readonly string[]>> = {
  'default-src': ["'self'"],
  'script-src': ["'self'"],
  'script-src-attr': ["'none'"],
  'style-src': ["'self'"],
  'style-src-attr': ["'none'"],
  'img-src': ["'self'"],
  'font-src': ["'self'"],
  'connect-src': ["'self'"],
  'object-src': ["'self'"],
  'base-uri': ["'none'"],
  'form-action': ["'self'"],
  'frame-ancestors': ["'none'"],
};

const common = { referrerPolicy: { policy: 'no-referrer' as const } };

const dashboard = helmet({
  ...common,
  contentSecurityPolicy: { useDefaults: false, directives: DASHBOARD_CSP },
  // The same as frame-ancestors 'none', for browsers that only know the older header.
  xFrameOptions: { action: 'deny' },
});

const api = helmet({
  ...common,
  contentSecurityPolicy: {
    useDefaults: false,
    directives: {
      'default-src': helmet.contentSecurityPolicy.dangerouslyDisableDefaultSrc,
      'frame-ancestors': ["'self'"],
    },
  },
  xFrameOptions: { action: 'sameorigin' },
});

/** Mount it first, so errors and 404s carry the headers too. */
export function securityHeaders(): RequestHandler {
  return (req, res, next) =>
    (req.path === '/api' || req.path.startsWith('/api/') ? api : dashboard)(req, res, next);
}
