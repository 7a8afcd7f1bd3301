// The review page in a real browser (Debian's chromium, driven by playwright-core) against a running service with
// the demo well-11 baseline loaded: select the baseline, screen a drifting sample through the API, see the flag
// arrive through the long poll with its reasons and its place on the biplot, dismiss it from the keyboard, and check
// through the API that it was recorded. Prints one line per check and "N passed, N failed"; exits 1 on a failure.
//
//   PARTWISE_URL        the service (default http://127.0.0.1:5080)
//   PARTWISE_CHROMIUM   the browser (default /usr/bin/chromium)
//   PARTWISE_ARTIFACTS  where the screenshot goes (default tests/browser/artifacts)
//   PARTWISE_REQUIRE_EXTERNAL=1  fail instead of skipping when the browser is missing
import { chromium } from "playwright-core";
import { existsSync, mkdtempSync, mkdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));
const root = resolve(here, "..", "..");
const BASE = (process.env.PARTWISE_URL || "http://127.0.0.1:5080").replace(/\/$/, "");
const CHROMIUM = process.env.PARTWISE_CHROMIUM || "/usr/bin/chromium";
const ARTIFACTS = resolve(process.env.PARTWISE_ARTIFACTS || join(here, "artifacts"));
const DEMO_BASELINE = "well-11 2025";

let passed = 0;
let failed = 0;
function check(name, ok, detail = "") {
  if (ok) { passed += 1; console.log(`ok - ${name}`); } else { failed += 1; console.log(`not ok - ${name}${detail ? `: ${detail}` : ""}`); }
  return ok;
}

async function api(path, { method = "GET", body } = {}) {
  const response = await fetch(BASE + path, {
    method,
    headers: body === undefined ? {} : { "Content-Type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await response.text();
  return { status: response.status, json: text ? JSON.parse(text) : null };
}

async function main() {
  // The demo baseline and the drifting well's 2026 samples, as committed in demo/.
  const baselines = await api("/v1/baselines");
  const baseline = baselines.json?.items?.find((b) => b.name === DEMO_BASELINE);
  if (!check("the service has the demo baseline", baseline, `no baseline named '${DEMO_BASELINE}' at ${BASE}`)) return;
  const drift = JSON.parse(readFileSync(join(root, "demo", "well-11-screenings.json"), "utf8")).samples;

  // Sample ids not screened before on this service, so the test can run again on the same store.
  const known = new Set((await api(`/v1/flags?baseline=${baseline.id}&status=any&limit=500`)).json.items.map((f) => f.sampleId));
  const fresh = (id) => (known.has(id) ? `${id}-r${Date.now() % 100000}` : id);
  const background = [6, 10, 14, 18, 21].map((i) => ({ ...drift[i], id: fresh(drift[i].id) }));
  const watched = { ...drift[drift.length - 1], id: fresh(drift[drift.length - 1].id) };

  const profile = mkdtempSync(join(tmpdir(), "partwise-chromium-"));
  // A fresh user-data-dir of its own (playwright passes it to chromium as --user-data-dir).
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
      "--disable-component-update", "--disable-sync"],
    viewport: { width: 1360, height: 860 },
    deviceScaleFactor: 1,
    reducedMotion: "reduce",
  });
  try {
    const page = await context.newPage();
    const pageErrors = [];
    page.on("pageerror", (e) => pageErrors.push(e.message));
    page.on("console", (m) => { if (m.type() === "error") pageErrors.push(m.text()); });

    // Earlier flags of the drifting well, screened before the page opens.
    const before = await api(`/v1/baselines/${baseline.id}/screenings`, { method: "POST", body: { samples: background } });
    check("earlier drifting samples are screened and flagged", before.status === 200 && before.json.results.every((r) => r.flagged), JSON.stringify(before.json));

    const response = await page.goto(`${BASE}/review`);
    check("/review is served as HTML without credentials", response.status() === 200 && response.headers()["content-type"].startsWith("text/html"), `${response.status()} ${response.headers()["content-type"]}`);
    await page.waitForSelector(`#baseline option[value="${baseline.id}"]`, { state: "attached" });

    // Every form control has a label (a <label for>, or an aria-label / aria-labelledby).
    const unlabelled = await page.evaluate(() => [...document.querySelectorAll("input, select, textarea")]
      .filter((c) => !(c.labels && c.labels.length > 0) && !c.getAttribute("aria-label") && !c.getAttribute("aria-labelledby"))
      .map((c) => c.id || c.name || c.outerHTML));
    check("every input, select and textarea has a label", unlabelled.length === 0, unlabelled.join(", "));
    check("the page carries the caution that flags are signals, not decisions",
      /statistical signals for a qualified analyst, not decisions/.test(await page.textContent("#caution")) &&
      /drinking water, food, health or safety/.test(await page.textContent("#caution")));

    await page.selectOption("#baseline", baseline.id);
    await page.waitForFunction((n) => document.querySelectorAll("#flag-list li").length >= n, background.length);
    check("the open flags of the baseline are listed", (await page.locator("#flag-list li").count()) >= background.length);

    // The page is now in its long poll; the next flag must arrive through it, not through a reload.
    await page.waitForFunction(() => document.querySelector("#poll-state").textContent.includes("Watching"));
    await page.waitForTimeout(700);
    const longPoll = page.waitForResponse((r) => r.url().includes("/v1/flags?") && r.url().includes("waitSeconds=") && r.status() === 200, { timeout: 40000 });
    const posted = await api(`/v1/baselines/${baseline.id}/screenings`, { method: "POST", body: { sample: watched } });
    const result = posted.json?.results?.[0];
    check("the drifting sample posted through the API is flagged", posted.status === 200 && result?.flagged && result.flagId, JSON.stringify(posted.json));
    const answer = await longPoll;
    check("a long poll with If-None-Match answered the new flag", answer.request().headers()["if-none-match"] !== undefined);
    const card = page.locator(`#flag-list button[data-flag="${result.flagId}"]`);
    await card.waitFor({ timeout: 10000 });
    check("the new flag appears in the open list", await card.isVisible());
    await page.waitForFunction((id) => document.querySelector("#announcer").textContent.includes(id), watched.id, { timeout: 5000 }).catch(() => {});
    check("the live region announces the new flag", (await page.textContent("#announcer")).includes(watched.id), await page.textContent("#announcer"));

    await card.click();
    await page.waitForFunction((id) => document.querySelector("#detail-heading").textContent === id, watched.id);
    const reasons = await page.$$eval("#reasons .reason", (items) => items.map((li) => ({
      label: li.querySelector(".ratio").textContent,
      text: li.querySelector(".reason-numbers").textContent,
      band: !!li.querySelector("svg .band"),
      dot: !!li.querySelector("svg .value"),
    })));
    check("each reason is shown with its ratio, value, z and expected range",
      reasons.length === result.reasons.length && reasons.every((r, i) => r.label === result.reasons[i].label && /value .+ · expected .+ to .+/.test(r.text) && r.band && r.dot),
      JSON.stringify(reasons));

    await page.waitForSelector(`#biplot svg circle.selected[data-sample="${watched.id}"]`, { timeout: 10000 });
    const biplot = (await api(`/v1/baselines/${baseline.id}/biplot?flags=${result.flagId}`)).json;
    const desc = await page.textContent("#biplot svg desc");
    const outside = biplot.samples[0].planeSquaredDistance > biplot.ellipse.threshold;
    check("the sample is placed on the biplot with the reference ellipse",
      (await page.locator("#biplot svg ellipse.ellipse").count()) === 1 && desc.includes(outside ? "outside" : "inside"), desc);
    const named = (await page.$$eval("#biplot svg text.part", (t) => t.map((x) => x.textContent)).then((t) => t.join(", "))) + " " + (await page.textContent("#biplot figcaption"));
    check("the biplot names every part (at its arrow, or in the caption when the arrow is short)",
      baseline.parts.every((p) => new RegExp(`(^|[ ,:])${p}(,|\\)|$| )`).test(named)), named);

    // The main controls are reachable with Tab, in order from the top of the page.
    await page.keyboard.press("Escape");
    await page.evaluate(() => { document.activeElement?.blur(); window.scrollTo(0, 0); });
    const reached = new Set();
    for (let i = 0; i < 80; i++) {
      await page.keyboard.press("Tab");
      const id = await page.evaluate(() => document.activeElement?.id || document.activeElement?.dataset?.flag || document.activeElement?.tagName);
      reached.add(id);
    }
    const wanted = ["baseline", "api-key", "key-save", result.flagId, "status-confirmed", "note", "reviewer", "review-submit"];
    const missing = wanted.filter((id) => !reached.has(id));
    check("the baseline, key, flags and review controls are reachable with Tab", missing.length === 0, `not reached: ${missing.join(", ")}`);
    const outline = await page.evaluate(() => { const b = document.getElementById("review-submit"); b.focus(); return getComputedStyle(b).outlineStyle; });
    check("focus is visible (an outline on the focused control)", outline !== "none", outline);

    mkdirSync(ARTIFACTS, { recursive: true });
    const shot = join(ARTIFACTS, "review-page.png");
    await page.evaluate(() => { document.activeElement?.blur(); window.scrollTo(0, 0); });
    await page.screenshot({ path: shot, fullPage: true });
    console.log(`screenshot: ${shot}`);

    // Dismiss it from the keyboard: arrow keys pick the radio, typing fills the note and name, Enter submits.
    const note = "Browser test: sodium and chloride rise together; checked against the field log.";
    await page.focus("#status-confirmed");
    await page.keyboard.press("ArrowRight");
    check("the arrow key moves the choice to Dismiss", await page.isChecked("#status-dismissed"));
    await page.focus("#note");
    await page.keyboard.type(note);
    await page.focus("#reviewer");
    await page.keyboard.press("Control+A");
    await page.keyboard.type("browser-test");
    const reviewed = page.waitForResponse((r) => r.url().endsWith(`/v1/flags/${result.flagId}/review`));
    await page.keyboard.press("Enter");
    const reviewAnswer = await reviewed;
    check("the review is posted and accepted", reviewAnswer.status() === 200, String(reviewAnswer.status()));
    await card.waitFor({ state: "detached", timeout: 10000 }).catch(() => {});
    check("the dismissed flag left the open list", (await page.locator(`#flag-list button[data-flag="${result.flagId}"]`).count()) === 0);

    const dismissed = (await api(`/v1/flags?baseline=${baseline.id}&status=dismissed&limit=500`)).json.items.find((f) => f.id === result.flagId);
    check("the API shows the flag dismissed with the note and reviewer",
      dismissed?.status === "dismissed" && dismissed.review?.note === note && dismissed.review?.reviewer === "browser-test", JSON.stringify(dismissed));
    const open = (await api(`/v1/flags?baseline=${baseline.id}&status=open&limit=500`)).json.items;
    check("the API no longer lists it as open", !open.some((f) => f.id === result.flagId));
    check("the page raised no script errors", pageErrors.length === 0, pageErrors.join(" | "));

    // A key entered once is kept in sessionStorage and sent as a Bearer credential on the page's API calls.
    await page.fill("#api-key", "review-test-key");
    const withKey = page.waitForRequest((r) => r.url().includes("/v1/flags?"), { timeout: 10000 });
    await page.press("#api-key", "Enter");
    const sent = (await withKey).headers().authorization;
    const kept = await page.evaluate(() => sessionStorage.getItem("partwise.apiKey"));
    check("an entered key is kept for the tab and sent as Authorization: Bearer", sent === "Bearer review-test-key" && kept === "review-test-key", `${sent} / ${kept}`);
    await page.click("#key-forget");
  } finally {
    await context.close();
    rmSync(profile, { recursive: true, force: true });
  }
}

// Without the browser the test skips, saying so, unless PARTWISE_REQUIRE_EXTERNAL=1 (set by .ci/run) makes it fail.
if (!existsSync(CHROMIUM) && process.env.PARTWISE_REQUIRE_EXTERNAL !== "1") {
  console.log(`skip - needs Debian's chromium at ${CHROMIUM} (apt-get install chromium) or PARTWISE_CHROMIUM`);
  console.log("0 passed, 0 failed");
  process.exit(0);
}

try {
  await main();
} catch (error) {
  check("the browser test ran to its end", false, error?.stack || String(error));
}
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed === 0 ? 0 : 1);
