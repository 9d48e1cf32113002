/** The frame every page shares: the cautions, the places to go, one stylesheet and one script, both ours. */

export function esc(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

export const PLACES = [
  { href: '/review', label: 'Review', key: 'g r' },
  { href: '/template', label: 'Template', key: 'g t' },
  { href: '/clusters', label: 'Unclaimed clusters', key: 'g c' },
  { href: '/triage', label: 'Triage', key: 'g i' },
  { href: '/report', label: 'Report', key: 'g p' },
] as const;

export function page(title: string, here: string, body: string, coder: string): string {
  const nav = PLACES.map((p) => `<li><a href="${p.href}"${p.href === here ? ' aria-current="page"' : ''}>${esc(p.label)}</a></li>`).join('');
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)} · trellis</title>
<link rel="stylesheet" href="/assets/page.css">
<script src="/assets/page.js" defer></script>
</head>
<body>
<a class="skip" href="#main">Skip to the content</a>
<header class="bar">
<p class="who">trellis · working as <strong>${esc(coder)}</strong></p>
<nav aria-label="Places"><ul>${nav}</ul></nav>
</header>
<main id="main" tabindex="-1">
<h1>${esc(title)}</h1>
${body}
</main>
<footer class="cautions">
<p><strong>Suggestions are aids: you decide every coding.</strong> The study holds personal data and stays on this computer: this page is served by trellis at 127.0.0.1 only and loads nothing from anywhere else. Ethics approval, consent and de-identification remain with the research team.</p>
</footer>
</body>
</html>
`;
}
