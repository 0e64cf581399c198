// Drives the CourseSim viewer in headless Chromium (Debian's package): the page loads a replay, the canvas is not
// blank, pressing play moves the boards, selecting a board fills the panel; a screenshot is saved.
// Usage: node viewer.mjs URL SCREENSHOT.png   (prints one JSON line of findings; exit 1 on any failed check)
import { chromium } from "playwright-core";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

const [url, shot] = process.argv.slice(2);
const exe = process.env.CHROMIUM || "/usr/bin/chromium";
const profile = mkdtempSync(join(tmpdir(), "coursesim-chromium-"));
// A fresh profile each run (playwright passes it to Chromium as its user data dir).
const browser = await chromium.launchPersistentContext(profile, {
  executablePath: exe,
  headless: true,
  viewport: { width: 1400, height: 860 },
  args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
         "--disable-component-update", "--disable-sync"],
});
const out = { url, checks: {} };
let ok = true;
const check = (name, pass, detail) => { out.checks[name] = { pass, detail }; if (!pass) ok = false; };
try {
  const page = await browser.newPage();
  const errors = [];
  page.on("pageerror", (e) => errors.push(e.message));
  await page.goto(url);
  await page.waitForFunction(() => window.__viewer && (window.__viewer.ready || window.__viewer.error), null, { timeout: 20000 });
  const error = await page.evaluate(() => window.__viewer.error);
  if (process.env.EXPECT_ERROR) {
    const shown = await page.textContent("#problem");
    check("error shown on the page", !!error && shown.includes(process.env.EXPECT_ERROR), shown);
  } else {
    check("loaded", !error, error || "");
    await page.waitForTimeout(300);
    // Not blank: many distinct colours in the canvas.
    const colours = await page.evaluate(() => {
      const c = document.getElementById("water"), g = c.getContext("2d"), d = g.getImageData(0, 0, c.width, c.height).data, seen = new Set();
      for (let i = 0; i < d.length; i += 4 * 97) seen.add((d[i] << 16) | (d[i + 1] << 8) | d[i + 2]);
      return seen.size;
    });
    check("canvas not blank", colours > 50, `${colours} distinct colours`);
    // Play moves the boards: from the middle of the replay, when every board is racing (early in the countdown most
    // boards wait further back, luffing, and barely move).
    await page.evaluate(() => { const s = document.getElementById("scrub"); s.value = String(Math.round(0.5 * Number(s.max))); s.dispatchEvent(new Event("input")); });
    await page.waitForTimeout(100);
    const before = await page.evaluate(() => window.__viewer.positions());
    await page.keyboard.press("Space");
    await page.waitForTimeout(1500);
    await page.keyboard.press("Space");
    const after = await page.evaluate(() => window.__viewer.positions());
    const moved = before.filter((p, i) => Math.hypot(p[0] - after[i][0], p[1] - after[i][1]) > 1).length;
    check("play moves the boards", moved >= Math.max(1, before.length / 2), `${moved} of ${before.length} boards moved`);
    // Selecting a board (a click on it) fills the panel.
    await page.keyboard.press("ArrowRight"); await page.keyboard.press("ArrowRight"); await page.keyboard.press("ArrowRight");
    const [sx, sy] = await page.evaluate(() => window.__viewer.screenOf(0));
    const box = await page.locator("#water").boundingBox();
    await page.mouse.click(box.x + sx, box.y + sy);
    await page.waitForTimeout(200);
    const name = await page.textContent("#panel-name");
    const speed = await page.evaluate(() => { const dd = document.querySelector('#panel-values dd[data-key="speed"]'); return dd ? dd.textContent : ""; });
    const selected = await page.evaluate(() => window.__viewer.selected);
    check("selecting a board fills the panel", selected === 0 && /kn$/.test(speed) && !name.startsWith("Select"), `${name}; speed ${speed}`);
    // Scrubbing: the timeline jumps to a point of the race (the screenshot is taken well into the race).
    const target = await page.evaluate(() => { const s = document.getElementById("scrub"); const v = Math.round(0.45 * Number(s.max)); s.value = String(v); s.dispatchEvent(new Event("input")); return v; });
    await page.waitForTimeout(300);
    const at = await page.evaluate(() => window.__viewer.frame);
    check("scrubbing moves the timeline", at === target, `frame ${at}, wanted ${target}`);
    if (shot) await page.screenshot({ path: shot });
  }
  check("no script errors", errors.length === 0, errors.join(" | "));
} catch (e) {
  check("ran", false, String(e && e.message || e));
} finally {
  await browser.close();
  rmSync(profile, { recursive: true, force: true });
}
console.log(JSON.stringify(out));
process.exit(ok ? 0 : 1);
