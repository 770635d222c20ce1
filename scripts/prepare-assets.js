// Copies pdf.js's character maps, standard fonts, image decoders and colour profiles into
// static/pdfjs/, so the viewer loads them from the app itself (never from a CDN).
import fs from 'node:fs';
import path from 'node:path';

const source = path.resolve('node_modules/pdfjs-dist');
const target = path.resolve('static/pdfjs');
const version = JSON.parse(fs.readFileSync(path.join(source, 'package.json'), 'utf8')).version;
const stamp = path.join(target, 'VERSION');

if (fs.existsSync(stamp) && fs.readFileSync(stamp, 'utf8') === version) process.exit(0);

fs.rmSync(target, { recursive: true, force: true });
for (const folder of ['cmaps', 'standard_fonts', 'wasm', 'iccs']) {
	fs.cpSync(path.join(source, folder), path.join(target, folder), { recursive: true });
}
fs.writeFileSync(stamp, version);
console.log(`pdf.js ${version} assets copied to static/pdfjs/`);
