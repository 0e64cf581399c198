// Renders a CourseSim experiment report (report.html) in headless Chromium (Debian's package) and checks it reads
// well: every chart loaded, the headline first, no table header squeezed narrower than a word, nothing wider than the
// page except inside a table's own scroll box; a full-page screenshot is saved.
// Usage: node report.mjs REPORT.html SCREENSHOT.png   (prints one JSON line of findings; exit 1 on any failed check)
import { chromium } from "playwright-core";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";

const [file, shot] = process.argv.slice(2);
const exe = process.env.CHROMIUM || "/usr/bin/chromium";
const profile = mkdtempSync(join(tmpdir(), "coursesim-chromium-"));
const browser = await chromium.launchPersistentContext(profile, {
  executablePath: exe,
  headless: true,
  viewport: { width: 1280, height: 900 },
  args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
});
const out = { file, checks: {} };
let ok = true;
const check = (name, pass, detail) => { out.checks[name] = { pass, detail }; if (!pass) ok = false; };
try {
  const page = await browser.newPage();
  await page.goto(pathToFileURL(resolve(file)).href);
  await page.waitForLoadState("load");
  const f = await page.evaluate(() => {
    const imgs = [...document.images];
    const firstH2 = document.querySelector("h2");
    const ths = [...document.querySelectorAll("th")].map((t) => ({ text: t.textContent, w: t.getBoundingClientRect().width,
      word: Math.max(...t.textContent.split(/\s+/).map((w) => w.length)) }));
    return {
      images: imgs.length,
      broken: imgs.filter((i) => !i.complete || i.naturalWidth === 0).length,
      firstSection: firstH2 ? firstH2.textContent : "",
      headline: document.querySelectorAll("ul.headline li").length,
      squeezed: ths.filter((t) => t.w < 6 * t.word).map((t) => t.text),
      pageOverflow: document.documentElement.scrollWidth - document.documentElement.clientWidth,
    };
  });
  check("charts", f.images >= 1 && f.broken === 0, `${f.images} images, ${f.broken} broken`);
  check("headline first", f.firstSection === "Headline" && f.headline >= 1, `${f.firstSection}, ${f.headline} items`);
  check("headers not squeezed", f.squeezed.length === 0, f.squeezed.join(" | "));
  check("no page-wide overflow", f.pageOverflow <= 0, `${f.pageOverflow} px`);
  // REPORT_TOP=1: the first screen only (the README's picture); else the whole page.
  await page.screenshot({ path: shot, fullPage: !process.env.REPORT_TOP });
} catch (e) {
  check("ran", false, String(e));
} finally {
  await browser.close();
  rmSync(profile, { recursive: true, force: true });
}
console.log(JSON.stringify(out));
process.exit(ok ? 0 : 1);
