/**
 * WebVTT reader. Files marked "spec" are the examples of the W3C WebVTT specification
 * ("WebVTT: The Web Video Text Tracks Format", editor's draft, source index.bs in the w3c/webvtt
 * repository), cited by section title and anchor beside each check. Character references that the
 * spec's HTML source uses only to display a character (&mdash;) are written as the character.
 */
import { describe, expect, test } from 'vitest';
import { readTranscriptBytes } from '../../src/ingest/read.js';
import { decodeEntities } from '../../src/ingest/vtt.js';
import { UserError } from '../../src/errors.js';

async function vtt(text: string, name = 'cues.vtt') {
  const ts = await readTranscriptBytes(Buffer.from(text), name);
  expect(ts).toHaveLength(1);
  return ts[0]!;
}

async function fails(text: string, name = 'bad.vtt'): Promise<UserError> {
  const err = await readTranscriptBytes(Buffer.from(text), name).catch((e) => e);
  expect(err).toBeInstanceOf(UserError);
  return err as UserError;
}

const rows = (t: Awaited<ReturnType<typeof vtt>>) => t.turns.map((x) => [x.speaker, x.start, x.end, x.text]);

// spec, "A simple caption file" (#introduction-caption)
const SPEC_INTERVIEW = `WEBVTT

00:11.000 --> 00:13.000
<v Roger Bingham>We are in New York City

00:13.000 --> 00:16.000
<v Roger Bingham>We're actually at the Lucern Hotel, just down the street

00:16.000 --> 00:18.000
<v Roger Bingham>from the American Museum of Natural History

00:18.000 --> 00:20.000
<v Roger Bingham>And with me is Neil deGrasse Tyson

00:20.000 --> 00:22.000
<v Roger Bingham>Astrophysicist, Director of the Hayden Planetarium

00:22.000 --> 00:24.000
<v Roger Bingham>at the AMNH.

00:24.000 --> 00:26.000
<v Roger Bingham>Thank you for walking down here.

00:27.000 --> 00:30.000
<v Roger Bingham>And I want to do a follow-up on the last conversation we did.

00:30.000 --> 00:31.500 align:right size:50%
<v Roger Bingham>When we e-mailed—

00:30.500 --> 00:32.500 align:left size:50%
<v Neil deGrasse Tyson>Didn't we talk about enough in that conversation?

00:32.000 --> 00:35.500 align:right size:50%
<v Roger Bingham>No! No no no no; 'cos 'cos obviously 'cos

00:32.500 --> 00:33.500 align:left size:50%
<v Neil deGrasse Tyson><i>Laughs</i>

00:35.500 --> 00:38.000
<v Roger Bingham>You know I'm so excited my glasses are falling off here.
`;

describe('W3C WebVTT specification examples', () => {
  test('"A simple caption file": voice spans name speakers; same-speaker cues merge; settings ignored', async () => {
    // spec, "A simple caption file" (#introduction-caption)
    const t = await vtt(SPEC_INTERVIEW, 'interview.vtt');
    expect(t.format).toBe('vtt');
    expect(t.labelled).toBe(true);
    expect(rows(t)).toEqual([
      [
        'Roger Bingham',
        11,
        31.5,
        "We are in New York City We're actually at the Lucern Hotel, just down the street from the American Museum of Natural History " +
          'And with me is Neil deGrasse Tyson Astrophysicist, Director of the Hayden Planetarium at the AMNH. Thank you for walking down here. ' +
          'And I want to do a follow-up on the last conversation we did. When we e-mailed—',
      ],
      ['Neil deGrasse Tyson', 30.5, 32.5, "Didn't we talk about enough in that conversation?"],
      ['Roger Bingham', 32, 35.5, "No! No no no no; 'cos 'cos obviously 'cos"],
      ['Neil deGrasse Tyson', 32.5, 33.5, 'Laughs'],
      ['Roger Bingham', 35.5, 38, "You know I'm so excited my glasses are falling off here."],
    ]);
    // offset/length span the merged cues' text lines in the source
    const first = t.turns[0]!;
    const span = t.source.slice(first.offset, first.offset + first.length);
    expect(span.startsWith('<v Roger Bingham>We are in New York City')).toBe(true);
    expect(span.endsWith('<v Roger Bingham>When we e-mailed—')).toBe(true);
  });

  test('"Caption cues with multiple lines": dialogue dashes are unnamed speakers', async () => {
    // spec, "Caption cues with multiple lines" (#introduction-multiple-lines)
    const t = await vtt(`WEBVTT

00:01.000 --> 00:04.000
Never drink liquid nitrogen.

00:05.000 --> 00:09.000
— It will perforate your stomach.
— You could die.

00:10.000 --> 00:14.000
The Organisation for Sample Public Service Announcements accepts no liability for the content of this advertisement, or for the consequences of any actions taken on the basis of the information provided.
`);
    expect(t.labelled).toBe(false);
    expect(rows(t)).toEqual([
      [null, 1, 4, 'Never drink liquid nitrogen.'],
      [null, 5, 9, 'It will perforate your stomach.'],
      [null, 5, 9, 'You could die.'],
      [null, 10, 14, expect.stringMatching(/^The Organisation for Sample .* information provided\.$/)],
    ]);
  });

  test('"Styling captions": STYLE and NOTE blocks skipped, cue identifier ignored, <b> removed', async () => {
    // spec, "Styling captions" (#styling)
    const t = await vtt(`WEBVTT

STYLE
::cue {
  background-image: linear-gradient(to bottom, dimgray, lightgray);
  color: papayawhip;
}
/* Style blocks cannot use blank lines nor "dash dash greater than" */

NOTE comment blocks can be used between style blocks.

STYLE
::cue(b) {
  color: peachpuff;
}

hello
00:00:00.000 --> 00:00:10.000
Hello <b>world</b>.

NOTE style blocks cannot appear after the first cue.
`);
    expect(rows(t)).toEqual([[null, 0, 10, 'Hello world.']]);
  });

  test('"Other caption and subtitling features": cue identifiers and character references', async () => {
    // spec, "Other caption and subtitling features" (#introduction-other-features), first example
    const t = await vtt(`WEBVTT

test
00:00.000 --> 00:02.000
This is a test.

123
00:00.000 --> 00:02.000
That's an, an, that's an L!

crédit de transcription
00:04.000 --> 00:05.000
Transcrit par Célestes&trade;
`);
    expect(t.turns).toHaveLength(1); // no speakers: the cues run on as one turn
    expect(t.turns[0]!.text).toBe("This is a test. That's an, an, that's an L! Transcrit par Célestes™");
    expect([t.turns[0]!.start, t.turns[0]!.end]).toEqual([0, 5]);
    expect(t.turns[0]!.text).not.toContain('crédit');
  });

  test('"Other caption and subtitling features": class and language spans removed', async () => {
    // spec, "Other caption and subtitling features" (#introduction-other-features), classes and <lang>
    const t = await vtt(`WEBVTT

04:02.500 --> 04:05.000
J'ai commencé le basket à l'âge de 13, 14 ans

04:05.001 --> 04:07.800
Sur les <i.foreignphrase><lang en>playground</lang></i>, ici à Montpellier
`);
    expect(t.turns[0]!.text).toBe("J'ai commencé le basket à l'âge de 13, 14 ans Sur les playground, ici à Montpellier");
    expect(t.turns[0]!.start).toBeCloseTo(242.5, 6);
    expect(t.turns[0]!.end).toBeCloseTo(247.8, 6);
  });

  test('"Other caption and subtitling features": voice spans with classes, unclosed and closed', async () => {
    // spec, "Other caption and subtitling features" (#introduction-other-features), voice spans
    const t = await vtt(`WEBVTT

00:00.000 --> 00:02.000
<v.first.loud Esme>It's a blue apple tree!

00:02.000 --> 00:04.000
<v Mary>No way!

00:04.000 --> 00:06.000
<v Esme>Hee!</v> <i>laughter</i>

00:06.000 --> 00:08.000
<v.loud Mary>That's awesome!
`);
    expect(rows(t)).toEqual([
      ['Esme', 0, 2, "It's a blue apple tree!"],
      ['Mary', 2, 4, 'No way!'],
      ['Esme', 4, 6, 'Hee! laughter'],
      ['Mary', 6, 8, "That's awesome!"],
    ]);
  });

  test('"Other caption and subtitling features": REGION blocks skipped, region settings ignored', async () => {
    // spec, "Other caption and subtitling features" (#introduction-other-features), regions
    const t = await vtt(`WEBVTT

REGION
id:fred
width:40%
lines:3
regionanchor:0%,100%
viewportanchor:10%,90%
scroll:up

REGION
id:bill
width:40%
lines:3
regionanchor:100%,100%
viewportanchor:90%,90%
scroll:up

00:00:00.000 --> 00:00:20.000 region:fred align:left
<v Fred>Hi, my name is Fred

00:00:02.500 --> 00:00:22.500 region:bill align:right
<v Bill>Hi, I'm Bill

00:00:05.000 --> 00:00:25.000 region:fred align:left
<v Fred>Would you like to get a coffee?

00:00:07.500 --> 00:00:27.500 region:bill align:right
<v Bill>Sure! I've only had one today.

00:00:10.000 --> 00:00:30.000 region:fred align:left
<v Fred>This is my fourth!

00:00:12.500 --> 00:00:32.500 region:fred align:left
<v Fred>OK, let's go.
`);
    expect(rows(t)).toEqual([
      ['Fred', 0, 20, 'Hi, my name is Fred'],
      ['Bill', 2.5, 22.5, "Hi, I'm Bill"],
      ['Fred', 5, 25, 'Would you like to get a coffee?'],
      ['Bill', 7.5, 27.5, "Sure! I've only had one today."],
      // consecutive Fred cues merge: start of the first, end of the last
      ['Fred', 10, 32.5, "This is my fourth! OK, let's go."],
    ]);
  });

  test('"Comments in WebVTT": NOTE blocks, one-line and multi-line, are skipped', async () => {
    // spec, "Comments in WebVTT" (#introduction-comments), second example
    const t = await vtt(`WEBVTT

NOTE
This file was written by Jill. I hope
you enjoy reading it. Some things to
bear in mind:
- I was lip-reading, so the cues may
not be 100% accurate
- I didn't pay too close attention to
when the cues should start or end.

00:01.000 --> 00:04.000
Never drink liquid nitrogen.

NOTE check next cue

00:05.000 --> 00:09.000
— It will perforate your stomach.
— You could die.

NOTE end of file
`);
    expect(t.turns.map((x) => x.text)).toEqual(['Never drink liquid nitrogen.', 'It will perforate your stomach.', 'You could die.']);
    expect(t.source).toContain('Jill');
    expect(t.turns.some((x) => x.text.includes('Jill'))).toBe(false);
  });

  test('"Chapters example": cue identifiers such as "Slide 1" are not text', async () => {
    // spec, "Chapters example" (#introduction-chapters)
    const t = await vtt(`WEBVTT

NOTE
This is from a talk Silvia gave about WebVTT.

Slide 1
00:00:00.000 --> 00:00:10.700
Title Slide

Slide 2
00:00:10.700 --> 00:00:47.600
Introduction by Naomi Black
`);
    expect(rows(t)).toEqual([[null, 0, 47.6, 'Title Slide Introduction by Naomi Black']]);
  });

  test('a timing line with no blank line before it still starts a new cue', async () => {
    // spec, "Conformance classes" (#conformance-classes): "the parser will create two cues even if
    // the blank line between them is skipped"
    const t = await vtt('WEBVTT\n\n00:01.000 --> 00:02.000\n<v Ana>One\n00:02.000 --> 00:03.000\n<v Ben>Two\n');
    expect(rows(t)).toEqual([
      ['Ana', 1, 2, 'One'],
      ['Ben', 2, 3, 'Two'],
    ]);
  });

  test('timestamps with and without hours, hours of more than two digits', async () => {
    // spec, "WebVTT file structure" (#file-structure): hours optional, two or more digits
    const t = await vtt('WEBVTT\n\n00:00:01.250 --> 00:59.000\n<v A>One\n\n101:00:00.000 --> 101:00:01.500\n<v B>Two\n');
    expect(rows(t)).toEqual([
      ['A', 1.25, 59, 'One'],
      ['B', 101 * 3600, 101 * 3600 + 1.5, 'Two'],
    ]);
  });
});

describe('WebVTT header and markup', () => {
  test('header text after WEBVTT, a BOM, and CRLF line endings are accepted', async () => {
    const body = 'WEBVTT - interview 3 (invented)\r\nKind: captions\r\n\r\n00:01.000 --> 00:02.000\r\n<v Ana>Hello.\r\n';
    const t = await vtt('\ufeff' + body);
    expect(rows(t)).toEqual([['Ana', 1, 2, 'Hello.']]);
  });

  test('a file without the WEBVTT header is refused at line 1', async () => {
    const e = await fails('00:01.000 --> 00:02.000\nHello\n', 't03.vtt');
    expect(e.describe()).toBe('t03.vtt:1: not a WebVTT file: the first line must be "WEBVTT"');
    expect((await fails('WEBVTTX\n\n00:01.000 --> 00:02.000\nHi\n')).line).toBe(1);
  });

  test('a broken timing line is an error naming its line', async () => {
    const e = await fails('WEBVTT\n\n00:01.000 --> 00:02.000\nFine\n\ncue-2\n00:02.000 --> 00:03\nBroken\n', 'p5.vtt');
    expect(e.file).toBe('p5.vtt');
    expect(e.line).toBe(7);
    expect(e.message).toMatch(/broken cue timing "00:02.000 --> 00:03"/);
    expect((await fails('WEBVTT\n\n00:01.000 --> 00:02.000\nFine\n\n00:61.000 --> 00:62.000\nx\n')).line).toBe(6);
    // an arrow typed wrongly, with an identifier line above it
    expect((await fails('WEBVTT\n\n1\n00:01.000 -> 00:02.000\nHi\n')).line).toBe(4);
  });

  test('"Name: text" at cue start names the speaker; unnamed cues continue the turn', async () => {
    const t = await vtt('WEBVTT\n\n00:01.000 --> 00:03.000\nInterviewer: Where did you grow up?\n\n00:03.500 --> 00:06.000\nP2: Near the coast.\n\n00:06.000 --> 00:08.000\nIn a fishing town.\n');
    expect(rows(t)).toEqual([
      ['Interviewer', 1, 3, 'Where did you grow up?'],
      ['P2', 3.5, 8, 'Near the coast. In a fishing town.'],
    ]);
  });

  test('cue timestamps and ruby text are removed; entities decoded', async () => {
    const t = await vtt('WEBVTT\n\n00:01.000 --> 00:05.000\n<v Ana>We <00:00:02.000>waited <c.slow>and</c> <00:00:03.500>waited &amp; &lt;sighed&gt;&nbsp;then <ruby>漢<rt>kan</rt></ruby>&lrm;.\n');
    expect(t.turns[0]!.text).toBe('We waited and waited & <sighed> then 漢\u200e.');
  });

  test('two voices in one cue give two turns', async () => {
    const t = await vtt('WEBVTT\n\n00:01.000 --> 00:03.000\n<v Ana>Ready?</v> <v Ben>Yes.</v>\n');
    expect(rows(t)).toEqual([
      ['Ana', 1, 3, 'Ready?'],
      ['Ben', 1, 3, 'Yes.'],
    ]);
  });

  test('inline codes in cue text are recorded', async () => {
    const t = await vtt('WEBVTT\n\n00:01.000 --> 00:03.000\n<v Ana>The ward was short {theme: Workload > Staffing} again.\n');
    expect(t.turns[0]!.text).toBe('The ward was short again.');
    expect(t.turns[0]!.codes).toEqual([{ paths: ['Workload > Staffing'], at: 18 }]);
  });

  test('text after a blank line inside a cue is kept with a warning', async () => {
    const t = await vtt('WEBVTT\n\n00:01.000 --> 00:03.000\n<v Ana>First part\n\nsecond part\n', 'gap.vtt');
    expect(t.turns[0]!.text).toBe('First part second part');
    expect(t.warnings).toEqual(['gap.vtt:6: text after a blank line was joined to the cue before it']);
  });

  test('a header with no cues is refused', async () => {
    expect((await fails('WEBVTT\n\nNOTE nothing yet\n')).message).toMatch(/no cues/);
  });

  test('decodeEntities leaves unknown references as written', () => {
    expect(decodeEntities('a &amp; b &#233; &#x263A; &unknown; &')).toBe('a & b é ☺ &unknown; &');
  });

  // W3C WebVTT, "WebVTT cue timings" (#webvtt-cue-timings): a cue's start time must be greater than
  // or equal to the start times of all previous cues, and its end time greater than its start time.
  test('timings that run backwards are kept in order but warned about, naming file and line', async () => {
    const t = await vtt(
      'WEBVTT\n\n00:10.000 --> 00:12.000\n<v Mina>Handover starts.\n\n00:05.000 --> 00:07.000\n<v Omar>Earlier?\n\n' +
        '00:20.000 --> 00:18.500\n<v Mina>Ends first.\n',
      'back.vtt',
    );
    expect(rows(t)).toEqual([
      ['Mina', 10, 12, 'Handover starts.'],
      ['Omar', 5, 7, 'Earlier?'],
      ['Mina', 20, 18.5, 'Ends first.'],
    ]);
    expect(t.warnings).toEqual([
      'back.vtt:6: cue timing runs backwards: it starts at 00:00:05.000, before a cue above it (00:00:10.000); kept in the order written',
      'back.vtt:9: cue timing runs backwards: it ends (00:00:18.500) before it starts (00:00:20.000)',
    ]);
    // Equal start times are allowed by the same rule.
    const same = await vtt('WEBVTT\n\n00:01.000 --> 00:02.000\nA\n\n00:01.000 --> 00:03.000\nB\n');
    expect(same.warnings).toEqual([]);
  });

  test('many backwards timings are listed up to five, then counted', async () => {
    let text = 'WEBVTT\n';
    for (let k = 0; k < 8; k++) text += `\n00:${String(9 - k).padStart(2, '0')}.000 --> 00:${String(9 - k).padStart(2, '0')}.500\nline ${k}\n`;
    const t = await vtt(text, 'many.vtt');
    expect(t.warnings).toHaveLength(6);
    expect(t.warnings[5]).toBe('many.vtt: 2 more cue timings run backwards');
  });

  test('an unclosed <v voice tag is kept as text with a warning naming file and line', async () => {
    const t = await vtt('WEBVTT\n\n00:01.000 --> 00:04.000\n<v Mina>Bed four is stable.\n\n00:04.000 --> 00:06.000\n<v Omar Thanks, noted.\n', 'open.vtt');
    expect(rows(t)).toEqual([
      ['Mina', 1, 6, 'Bed four is stable. <v Omar Thanks, noted.'],
    ]);
    expect(t.warnings).toEqual(['open.vtt:7: voice tag "<v Omar Thanks, noted." is not closed with ">": kept as text, no speaker taken from it']);
    // A "<" that opens no voice tag is ordinary text, not worth a warning.
    expect((await vtt('WEBVTT\n\n00:01.000 --> 00:02.000\nsats < 90 means call\n')).warnings).toEqual([]);
  });
});
