import sharp from 'sharp';
import type { Transaction } from 'sequelize';
import { Finding, FindingPhoto, type User, type Workshop } from '../../server/src/models/index.js';
import { encodePhoto } from '../../server/src/services/photos.service.js';
import type { PhotoStore } from '../../server/src/storage/index.js';

/*
 * Invented pictures for the demo's findings: simple drawings made at seed time, each plainly
 * labelled as a demo photo. They go through the same re-encoding as an engineer's upload and are
 * stored through the photo store under fixed keys, so seeding again overwrites rather than piles up.
 */

const W = 1600;
const H = 1200;

const frame = (body: string, caption: string) => `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}">
  <defs>
    <linearGradient id="bench" x1="0" y1="0" x2="0" y2="1">
      <stop offset="0" stop-color="#5b6470"/><stop offset="1" stop-color="#2f353d"/>
    </linearGradient>
  </defs>
  <rect width="${W}" height="${H}" fill="url(#bench)"/>
  ${body}
  <rect x="40" y="40" width="420" height="96" rx="14" fill="#fdf6e3" stroke="#1d232a" stroke-width="4"/>
  <text x="250" y="104" text-anchor="middle" font-family="DejaVu Sans, sans-serif" font-size="50" font-weight="bold" fill="#1d232a">Demo photo</text>
  <rect x="40" y="${H - 120}" width="${W - 80}" height="80" rx="12" fill="#fdf6e3" fill-opacity="0.92"/>
  <text x="70" y="${H - 66}" font-family="DejaVu Sans, sans-serif" font-size="38" fill="#1d232a">${caption}</text>
</svg>`;

/** A spark plug's firing end, close up: the side electrode, the centre electrode and the gap between them. */
const sparkPlug = frame(
  `<rect x="560" y="760" width="480" height="260" rx="20" fill="#b9c0c7" stroke="#20262c" stroke-width="6"/>
  ${Array.from({ length: 7 }, (_, i) => `<line x1="560" y1="${785 + i * 34}" x2="1040" y2="${770 + i * 34}" stroke="#7d868f" stroke-width="8"/>`).join('')}
  <rect x="600" y="660" width="400" height="110" rx="12" fill="#d6dbe0" stroke="#20262c" stroke-width="6"/>
  <path d="M740 660 L740 520 Q740 500 760 500 L840 500 Q860 500 860 520 L860 660 Z" fill="#efe9dd" stroke="#20262c" stroke-width="6"/>
  <rect x="780" y="400" width="40" height="110" fill="#8a8f96" stroke="#20262c" stroke-width="5"/>
  <circle cx="800" cy="400" r="22" fill="#6d727a" stroke="#20262c" stroke-width="5"/>
  <path d="M960 660 L960 300 Q960 250 910 250 L760 250" fill="none" stroke="#4a4f57" stroke-width="44" stroke-linecap="round"/>
  <path d="M960 660 L960 300 Q960 250 910 250 L760 250" fill="none" stroke="#8b9098" stroke-width="30" stroke-linecap="round"/>
  <line x1="700" y1="278" x2="700" y2="378" stroke="#ffd166" stroke-width="5"/>
  <line x1="680" y1="278" x2="720" y2="278" stroke="#ffd166" stroke-width="5"/>
  <line x1="680" y1="378" x2="720" y2="378" stroke="#ffd166" stroke-width="5"/>
  <text x="660" y="340" text-anchor="end" font-family="DejaVu Sans, sans-serif" font-size="46" fill="#ffd166">gap 0.95 mm</text>`,
  'Spark plug, cylinder 2: electrode edges rounded, gap opened up to 0.95 mm',
);

/** An exhaust port flange with a sooty trail where the gasket has flattened. */
const exhaustGasket = frame(
  `<rect x="300" y="380" width="460" height="420" rx="30" fill="#8d949b" stroke="#20262c" stroke-width="6"/>
  ${Array.from({ length: 6 }, (_, i) => `<rect x="300" y="${400 + i * 66}" width="460" height="26" fill="#767d85"/>`).join('')}
  <rect x="760" y="470" width="70" height="240" fill="#55606b" stroke="#20262c" stroke-width="6"/>
  <rect x="830" y="490" width="26" height="200" fill="#3b3026" stroke="#20262c" stroke-width="4"/>
  <rect x="856" y="470" width="70" height="240" fill="#6b747d" stroke="#20262c" stroke-width="6"/>
  <path d="M926 530 L1300 530 Q1380 530 1380 610 L1380 900" fill="none" stroke="#a5683a" stroke-width="120"/>
  <path d="M926 530 L1300 530 Q1380 530 1380 610 L1380 900" fill="none" stroke="#c27d47" stroke-width="70"/>
  <circle cx="793" cy="500" r="18" fill="#c9ccd0" stroke="#20262c" stroke-width="4"/>
  <circle cx="793" cy="680" r="18" fill="#c9ccd0" stroke="#20262c" stroke-width="4"/>
  <path d="M843 690 Q860 780 900 860 Q930 930 880 1000" fill="none" stroke="#1a1612" stroke-width="34" stroke-linecap="round" opacity="0.8"/>
  <path d="M843 690 Q880 760 960 820" fill="none" stroke="#1a1612" stroke-width="18" stroke-linecap="round" opacity="0.6"/>`,
  'Exhaust flange, cylinder 2: soot trail below the joint, gasket flattened',
);

/** A coolant hose bent over a stub, with surface cracks at the bend and a drip. */
const coolantHose = frame(
  `<rect x="200" y="560" width="300" height="200" rx="16" fill="#9aa1a8" stroke="#20262c" stroke-width="6"/>
  <rect x="480" y="610" width="120" height="100" fill="#c9ccd0" stroke="#20262c" stroke-width="5"/>
  <path d="M560 660 L860 660 Q1060 660 1060 460 L1060 300" fill="none" stroke="#1e2226" stroke-width="150"/>
  <path d="M560 660 L860 660 Q1060 660 1060 460 L1060 300" fill="none" stroke="#30363c" stroke-width="120"/>
  <rect x="600" y="580" width="40" height="160" rx="6" fill="#c0c4c9" stroke="#20262c" stroke-width="4"/>
  <rect x="1000" y="330" width="120" height="36" rx="6" fill="#c0c4c9" stroke="#20262c" stroke-width="4"/>
  <path d="M930 600 l20 -30 l-10 -20 l25 -25 M960 630 l30 -20 l0 -25 l28 -15 M900 575 l15 -35 l20 -5 M990 590 l25 -10 l10 -30" fill="none" stroke="#d9d4c7" stroke-width="6"/>
  <path d="M900 740 Q910 790 900 820 Q890 840 900 850 Q915 840 905 820" fill="#7cc6e0" stroke="#2b6d85" stroke-width="3"/>
  <ellipse cx="902" cy="900" rx="60" ry="14" fill="#7cc6e0" opacity="0.6"/>`,
  'Coolant hose at the cylinder head: cracks round the bend, weeping coolant',
);

/** Which demo finding gets which picture, by its title. */
const DEMO_PHOTOS: { title: string; key: string; svg: string }[] = [
  { title: 'Spark plug electrodes worn past the limit', key: 'demo/spark-plug-gap', svg: sparkPlug },
  { title: 'Exhaust flange gasket blowing', key: 'demo/exhaust-flange-soot', svg: exhaustGasket },
  { title: 'Coolant hose cracked at cylinder head', key: 'demo/coolant-hose-cracks', svg: coolantHose },
];

/** The SVG drawing for a finding title, if the demo has one (used by the seed test too). */
export function demoPhotoSvg(title: string): string | undefined {
  return DEMO_PHOTOS.find((p) => p.title === title)?.svg;
}

/**
 * Gives each listed finding of the job one demo photo, unless it has a photo already. Runs inside
 * the seed's transaction; the files are written first, under fixed keys, so a rolled-back seed
 * leaves at most files the next seed writes again.
 */
export async function seedDemoPhotos(w: Workshop, jobId: string, uploader: User, store: PhotoStore, at: Date, t: Transaction): Promise<number> {
  const findings = await Finding.findAll({ where: { workshopId: w.id, jobId }, transaction: t });
  let added = 0;
  for (const p of DEMO_PHOTOS) {
    const f = findings.find((x) => x.title === p.title);
    if (!f) continue;
    if (await FindingPhoto.count({ where: { findingId: f.id }, transaction: t })) continue;
    // Rendered from the SVG to a PNG first, so the stored JPEG comes out of the upload pipeline itself.
    const png = await sharp(Buffer.from(p.svg), { density: 72 }).png().toBuffer();
    const e = await encodePhoto({ originalname: `${p.key.split('/').pop()}.png`, buffer: png });
    const storageKey = `${p.key}.jpg`;
    const thumbKey = `${p.key}-thumb.jpg`;
    await store.put(storageKey, e.full, 'image/jpeg');
    await store.put(thumbKey, e.thumb, 'image/jpeg');
    await FindingPhoto.create(
      {
        workshopId: w.id, jobId, findingId: f.id, storageKey, thumbKey, width: e.width, height: e.height,
        thumbWidth: e.thumbWidth, thumbHeight: e.thumbHeight, bytes: e.full.length, uploadedBy: uploader.id, createdAt: at,
      },
      { transaction: t },
    );
    added += 1;
  }
  return added;
}
