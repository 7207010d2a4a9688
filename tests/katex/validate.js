// Validate LaTeX fragments with KaTeX: reads a JSON array of strings on stdin and prints
// a JSON array with null for each fragment KaTeX renders, or KaTeX's error message.
// KaTeX is looked up in $GACALC_KATEX_DIR, then .cache/katex and node_modules at the
// project root (scripts/install_katex.sh installs it into .cache/katex).
'use strict';
const path = require('path');

function loadKatex() {
  const root = path.resolve(__dirname, '..', '..');
  const places = [];
  if (process.env.GACALC_KATEX_DIR) places.push(process.env.GACALC_KATEX_DIR);
  places.push(path.join(root, '.cache', 'katex', 'node_modules', 'katex'));
  places.push(path.join(root, 'node_modules', 'katex'));
  for (const place of places) {
    try {
      return require(place);
    } catch (error) {
      if (error.code !== 'MODULE_NOT_FOUND') throw error;
    }
  }
  process.stderr.write('katex not found; run scripts/install_katex.sh\n');
  process.exit(3);
}

const katex = loadKatex();
if (process.argv.includes('--version')) {
  process.stdout.write(katex.version + '\n');
  process.exit(0);
}
let input = '';
process.stdin.setEncoding('utf8');
process.stdin.on('data', (chunk) => { input += chunk; });
process.stdin.on('end', () => {
  const fragments = JSON.parse(input);
  const results = fragments.map((fragment) => {
    try {
      katex.renderToString(fragment, { throwOnError: true, displayMode: true, strict: 'error' });
      return null;
    } catch (error) {
      return String(error.message);
    }
  });
  process.stdout.write(JSON.stringify(results) + '\n');
});
