import { readdirSync, readFileSync } from 'node:fs'
import path from 'node:path'
import { describe, expect, it } from 'vitest'
import { ESLint } from 'eslint'

/**
 * Static guard against stored script injection (security.md test 53; ASVS 5.0 3.2.2, 1.3.1;
 * WSTG-CLNT-03): the client puts text from people into the page only through Vue's text
 * interpolation and bound attributes, never as HTML, and never compiles a template at run time.
 * `tests/e2e/script-injection.test.ts` shows the same in the browser with real payloads.
 */
function filesUnder(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name)
    return entry.isDirectory() ? filesUnder(full) : /\.(vue|ts)$/.test(entry.name) ? [full] : []
  })
}

const clientFiles = [...filesUnder(path.resolve('src')), ...filesUnder(path.resolve('shared'))]

/** Ways to turn a string into markup or code in the browser. */
const SINKS: [string, RegExp, string][] = [
  ['v-html', /\bv-html\b/, '<p v-html="memo.body" />'],
  ['innerHTML / outerHTML', /\.(?:inner|outer)HTML\b/, 'el.innerHTML = text'],
  ['insertAdjacentHTML', /\binsertAdjacentHTML\b/, "el.insertAdjacentHTML('beforeend', text)"],
  ['document.write', /\bdocument\.write(?:ln)?\s*\(/, 'document.write(text)'],
  ['createContextualFragment', /\bcreateContextualFragment\b/, 'range.createContextualFragment(text)'],
  ['DOMParser', /\bnew\s+DOMParser\b/, 'new DOMParser().parseFromString(text, "text/html")'],
  ['eval', /(?<![\w.])eval\s*\(/, 'eval(text)'],
  ['new Function', /\bnew\s+Function\s*\(/, 'new Function(text)()'],
  ['string timer', /\bset(?:Timeout|Interval)\s*\(\s*['"`]/, "setTimeout('run()', 10)"],
  ['run-time template compiler', /\bfrom\s+['"]vue\/dist\/vue(?:\.esm-bundler)?(?:\.js)?['"]|\bcompile\s*\(\s*[^)]/, 'const render = compile(template)'],
  ['innerHTML in a render function', /\binnerHTML\s*:/, "h('div', { innerHTML: text })"],
]

describe('no raw HTML in the client', () => {
  it('reads the client’s source files', () => {
    expect(clientFiles.filter((f) => f.endsWith('.vue')).length).toBeGreaterThan(50)
  })

  it.each(SINKS)('the %s pattern finds its sample', (_name, pattern, sample) => {
    expect(sample).toMatch(pattern)
  })

  it.each(SINKS)('no %s in src/ or shared/', (_name, pattern) => {
    const found = clientFiles.flatMap((file) =>
      readFileSync(file, 'utf8')
        .split('\n')
        .flatMap((line, i) => (pattern.test(line) ? [`${path.relative(process.cwd(), file)}:${i + 1}: ${line.trim()}`] : [])),
    )
    expect(found).toEqual([])
  })

  it('uses the runtime-only Vue build: no alias brings in the template compiler', () => {
    for (const config of ['vite.config.ts', 'vitest.config.ts']) {
      expect(readFileSync(path.resolve(config), 'utf8'), config).not.toMatch(/vue\/dist\/vue\.(?:esm-bundler|global|runtime)?/)
    }
  })

  it('keeps vue/no-v-html an error in the lint configuration, so CI fails on it', async () => {
    const eslint = new ESLint()
    const config = await eslint.calculateConfigForFile(path.resolve('src/App.vue'))
    expect(config.rules?.['vue/no-v-html']?.[0] ?? config.rules?.['vue/no-v-html']).toBe(2)
  })
})
