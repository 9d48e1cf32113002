/**
 * The page's own stylesheet and script, served by the server itself (tsc copies no other file,
 * so they live here as strings). Readable without colour: marks are underlined and numbered,
 * states are written in words, focus is a thick outline.
 */

export const CSS = `
:root { --ink: #1d1d1b; --paper: #fbfaf7; --line: #8a877f; --soft: #efece4; --focus: #1a4fd6; font-size: 18px; }
* { box-sizing: border-box; }
body { margin: 0; font-family: Georgia, "Times New Roman", serif; color: var(--ink); background: var(--paper); line-height: 1.55; }
a { color: inherit; }
.skip { position: absolute; left: -999px; } .skip:focus { left: 1rem; top: 1rem; background: var(--paper); padding: .5rem; z-index: 2; }
:focus-visible { outline: 4px solid var(--focus); outline-offset: 2px; }
.bar { display: flex; flex-wrap: wrap; gap: .5rem 2rem; align-items: baseline; padding: .5rem 1.5rem; border-bottom: 1px solid var(--line); font-family: system-ui, sans-serif; font-size: .85rem; }
.bar ul { display: flex; flex-wrap: wrap; gap: .25rem 1.25rem; list-style: none; margin: 0; padding: 0; }
.bar a[aria-current] { font-weight: 700; text-decoration-thickness: 3px; }
.who { margin: 0; }
main { max-width: 46rem; margin: 0 auto; padding: 1rem 1.25rem 3rem; }
h1 { font-size: 1.2rem; font-family: system-ui, sans-serif; margin: .5rem 0; }
h2 { font-size: 1rem; font-family: system-ui, sans-serif; }
.progress, .where, .hint, .state, .conf, .reasons, .cautions, .keys, .moves, .other, table { font-family: system-ui, sans-serif; font-size: .85rem; }
.message { border: 2px solid var(--ink); padding: .4rem .75rem; font-family: system-ui, sans-serif; font-size: .9rem; }
.passage { margin: 1rem 0 1.5rem; }
.question { font-style: italic; }
.label, .speaker { font-family: system-ui, sans-serif; font-size: .75rem; text-transform: uppercase; letter-spacing: .05em; margin: 0; font-style: normal; }
.turn { color: #4a4843; font-size: .9rem; border-left: 2px dotted var(--line); padding-left: .75rem; margin: .75rem 0; }
.this-turn { border-left: 4px solid var(--ink); padding-left: 1rem; margin: 1rem 0; }
.this-turn .text { font-size: 1.3rem; line-height: 1.6; margin: .25rem 0; }
mark { background: none; color: inherit; text-decoration: underline; text-decoration-thickness: 3px; text-underline-offset: 4px; font-weight: 700; }
.tag { font-family: system-ui, sans-serif; font-size: .6em; border: 1px solid var(--ink); border-radius: 50%; padding: 0 .3em; margin-left: .15em; }
.candidates { list-style: none; padding: 0; margin: 0; display: grid; gap: .75rem; }
.candidate { border: 1px solid var(--line); border-radius: 6px; padding: .6rem .9rem; background: #fff; }
.candidate.accepted { border: 3px double var(--ink); } .candidate.rejected { opacity: .65; } .candidate.rejected .theme { text-decoration: line-through; }
.cand-head { display: flex; flex-wrap: wrap; gap: .25rem 1rem; align-items: baseline; }
.cand-n { font-family: system-ui, sans-serif; font-weight: 700; border: 2px solid var(--ink); border-radius: 50%; width: 1.6rem; height: 1.6rem; display: inline-grid; place-items: center; font-size: .8rem; }
.theme { margin: 0; font-size: 1.05rem; }
.conf { margin: 0; } .reasons { margin: .3rem 0; padding-left: 1.2rem; }
button { font: inherit; font-family: system-ui, sans-serif; font-size: .85rem; padding: .35rem .7rem; border: 2px solid var(--ink); background: var(--paper); color: var(--ink); border-radius: 4px; cursor: pointer; margin: .15rem .25rem .15rem 0; }
button:hover { background: var(--soft); } button.accept { font-weight: 700; } button[disabled] { opacity: .45; cursor: default; }
kbd { font-family: ui-monospace, monospace; font-size: .8em; border: 1px solid var(--line); border-bottom-width: 2px; border-radius: 3px; padding: 0 .3em; margin-left: .2em; background: #fff; }
.moves { margin: 1.25rem 0; padding: .5rem 0; border-top: 1px solid var(--line); border-bottom: 1px solid var(--line); }
.row { display: flex; flex-wrap: wrap; gap: .4rem; align-items: center; margin: .6rem 0; }
.row label { min-width: 12rem; }
input, textarea { font: inherit; font-size: .9rem; padding: .3rem .5rem; border: 1px solid var(--ink); border-radius: 3px; flex: 1 1 12rem; min-width: 0; }
.inline { display: inline; }
table { border-collapse: collapse; width: 100%; } caption { text-align: left; font-weight: 700; padding: .4rem 0; }
th, td { text-align: left; padding: .3rem .5rem; border-bottom: 1px solid var(--soft); vertical-align: top; } td { text-align: right; }
.depth-1 { padding-left: 1.5rem; } .depth-2 { padding-left: 2.5rem; } .depth-3, .depth-4 { padding-left: 3.5rem; }
.num { font-family: ui-monospace, monospace; font-size: .8rem; } .badge { font-size: .7rem; border: 1px solid var(--line); padding: 0 .3em; border-radius: 3px; }
.clusters { padding-left: 1.2rem; } .cluster { margin-bottom: 1.5rem; } .cid, .pid { font-family: ui-monospace, monospace; font-size: .8rem; }
blockquote { margin: .25rem 0 1rem; padding-left: .75rem; border-left: 3px solid var(--line); }
.cautions { max-width: 46rem; margin: 0 auto; padding: 1rem 1.25rem 2rem; color: #4a4843; border-top: 1px solid var(--line); }
.keys dl { display: grid; grid-template-columns: max-content 1fr; gap: .2rem 1rem; }
.keys dd { margin: 0; }
@media (max-width: 640px) { :root { font-size: 16px; } main { padding: .75rem; } .this-turn .text { font-size: 1.15rem; } .row label { min-width: 100%; } }
`;

/**
 * Keys: every button and text box with a data-key (or data-focus-key) answers to it, so the keys
 * shown on the page are the keys that work. "x 2" is x then 2. Typing in a box is never a key.
 */
export const JS = `
(function () {
  var pending = '';
  var goto = { r: '/review', t: '/template', c: '/clusters', i: '/triage', p: '/report' };
  document.addEventListener('keydown', function (e) {
    var t = e.target;
    var typing = t && (t.tagName === 'INPUT' || t.tagName === 'TEXTAREA' || t.tagName === 'SELECT');
    if (typing) { if (e.key === 'Escape') t.blur(); return; }
    if (e.ctrlKey || e.metaKey || e.altKey) return;
    var k = e.key;
    if (pending === 'g') { pending = ''; if (goto[k]) { location.href = goto[k]; e.preventDefault(); } return; }
    if (k === 'g') { pending = 'g'; return; }
    if (k === '?') { var d = document.querySelector('details.keys'); if (d) { d.open = !d.open; e.preventDefault(); } return; }
    var key = pending ? pending + ' ' + k : k;
    pending = '';
    if (k === 'x') { pending = 'x'; return; }
    if (k === 'ArrowRight') key = 'j';
    if (k === 'ArrowLeft') key = 'k';
    var b = document.querySelector('[data-key="' + CSS.escape(key) + '"]');
    if (b && !b.disabled) { e.preventDefault(); b.click(); return; }
    var f = document.querySelector('[data-focus-key="' + CSS.escape(key) + '"]');
    if (f) { e.preventDefault(); f.focus(); }
  });
})();
`;
