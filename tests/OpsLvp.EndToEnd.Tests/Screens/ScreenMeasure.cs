using System.Text.Json;
using Microsoft.Playwright;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using Xunit.Abstractions;

namespace OpsLvp.EndToEnd.Tests.Screens;

/// <summary>
/// Measures one page at one screen size in a real Chromium: the phase in view and not covered, the given texts present,
/// visible, inside the screen and not cut off, the wall's text large enough to read across a room, and every control a
/// finger can hit on a touch screen. Returns what is wrong, in words, so one test can loop the sizes and say all of it.
/// </summary>
internal static class ScreenMeasure
{
    /// <summary>The four screen sizes of docs/screens.md.</summary>
    public static readonly (string Name, int Width, int Height)[] Sizes =
    [
        ("wall", 1920, 1080),
        ("console", 1440, 900),
        ("tablet", 1024, 768),
        ("phone", 390, 844),
    ];

    /// <summary>
    /// Smallest text on the wall at 1920×1080, in CSS px. Our own rule, from memory of common practice for wall displays
    /// (about 2 % of the screen height for anything an operator must read from across the room; 2vh is 21.6 px there).
    /// </summary>
    public const double WallMinFontPx = 21;

    /// <summary>
    /// Smallest touch target on a tablet or phone, in CSS px: 44×44 (WCAG 2.1 success criterion 2.5.5 "Target Size",
    /// level AAA; common practice for touch screens).
    /// </summary>
    public const double MinTargetPx = 44;

    /// <summary>Resizes <paramref name="page"/>, waits for the layout to settle and takes its picture.</summary>
    public static async Task ShowAtAsync(IPage page, (string Name, int Width, int Height) size, string picture, ITestOutputHelper output)
    {
        await page.SetViewportSizeAsync(size.Width, size.Height);
        // two animation frames after the resize: the layout and its paint are done
        await page.EvaluateAsync("() => new Promise(r => requestAnimationFrame(() => requestAnimationFrame(r)))");
        var path = Artifacts.PathFor(picture);
        await page.ScreenshotAsync(new() { Path = path });
        output.WriteLine($"screenshot: {path}");
    }

    /// <summary>
    /// What is wrong on <paramref name="page"/> as it is now: <paramref name="phase"/> (a selector; empty: not checked) must be inside the
    /// screen and not covered by any of <paramref name="texts"/>; each of <paramref name="texts"/> (selector, words it must
    /// contain) visible, inside the screen width and not clipped; on the wall size the texts and the phase at least
    /// <see cref="WallMinFontPx"/>; on a touch size every visible control at least <see cref="MinTargetPx"/> square; the
    /// selectors in <paramref name="inView"/> seen without scrolling (their first line at least).
    /// </summary>
    public static async Task<IReadOnlyList<string>> ProblemsAsync(IPage page, string where, string phase, IReadOnlyList<(string Selector, string Words)> texts, bool wall, bool touch, IReadOnlyList<string>? inView = null)
    {
        var report = await page.EvaluateAsync<JsonElement>("""
            ([phase, texts, wall, touch, minFont, minTarget, inView]) => {
              const problems = [];
              const W = window.innerWidth, H = window.innerHeight;
              const shown = e => { const s = getComputedStyle(e); const r = e.getBoundingClientRect(); return s.visibility !== 'hidden' && s.display !== 'none' && r.width > 0 && r.height > 0; };
              // cut on purpose (a long message's first lines) only where the alarm offers the rest: "Show all", "full text on the console"
              const meant = (x, e) => x.dataset.clamped === 'true' && e.querySelector('[data-more]') !== null;
              const hasText = x => [...x.childNodes].some(n => n.nodeType === 3 && n.textContent.trim());
              const smallest = e => Math.min(...[e, ...e.querySelectorAll('*')].filter(x => shown(x) && hasText(x)).map(x => parseFloat(getComputedStyle(x).fontSize)));
              const clipped = e => [e, ...e.querySelectorAll('*')].filter(x => shown(x) && hasText(x) && !meant(x, e) && getComputedStyle(x).overflow !== 'visible'
                  && (x.scrollWidth > x.clientWidth + 1 || x.scrollHeight > x.clientHeight + 1) && x.clientHeight > 0
                  && !['auto', 'scroll'].includes(getComputedStyle(x).overflowY)).map(x => `${x.tagName.toLowerCase()}.${[...x.classList].join('.')} ${x.scrollWidth}×${x.scrollHeight} in ${x.clientWidth}×${x.clientHeight}`).join(', ');
              // the part of e's box that can be seen: inside every ancestor that clips (a scrolling alarm list)
              const seen = e => {
                let r = e.getBoundingClientRect(), top = r.top, left = r.left, bottom = r.bottom, right = r.right;
                for (let a = e.parentElement; a; a = a.parentElement) {
                  if (getComputedStyle(a).overflow === 'visible') continue;
                  const q = a.getBoundingClientRect();
                  top = Math.max(top, q.top); left = Math.max(left, q.left); bottom = Math.min(bottom, q.bottom); right = Math.min(right, q.right);
                }
                return { top, left, bottom, right, width: Math.max(0, right - left), height: Math.max(0, bottom - top) };
              };
              const box = r => `${Math.round(r.left)},${Math.round(r.top)} ${Math.round(r.width)}×${Math.round(r.height)}`;
              const p = phase ? document.querySelector(phase) : null;
              let pr = null;
              if (!phase) { /* not asked */ }
              else if (!p || !shown(p)) { problems.push(`phase ${phase} not shown`); }
              else {
                pr = p.getBoundingClientRect();
                if (pr.top < -0.5 || pr.left < -0.5 || pr.bottom > H + 0.5 || pr.right > W + 0.5) problems.push(`phase outside the screen at ${box(pr)}`);
                if (wall && smallest(p) < minFont) problems.push(`phase text ${smallest(p)} px < ${minFont} px`);
              }
              if (document.documentElement.scrollWidth > W + 1) problems.push(`page wider than the screen: ${document.documentElement.scrollWidth} px > ${W} px`);
              for (const [sel, words] of texts) {
                const e = document.querySelector(sel);
                if (!e || !shown(e)) { problems.push(`${sel} not shown`); continue; }
                const t = e.innerText.replace(/\s+/g, ' ');
                for (const w of words.split('|')) if (!t.includes(w)) problems.push(`${sel} does not say "${w}": "${t}"`);
                const r = e.getBoundingClientRect(), v = seen(e);
                if (r.left < -0.5 || r.right > W + 0.5) problems.push(`${sel} outside the screen width at ${box(r)}`);
                if (inView.includes(sel) && (v.height < 8 || v.top < -0.5 || v.top + 8 > H)) problems.push(`${sel} not in view without scrolling: its seen part is ${box(v)} on a ${W}×${H} screen`);
                const spill = [...e.querySelectorAll('*')].filter(x => shown(x) && hasText(x)).map(x => x.getBoundingClientRect())
                  .filter(x => x.top < r.top - 1 || x.bottom > r.bottom + 1 || x.left < r.left - 1 || x.right > r.right + 1);
                if (spill.length > 0) problems.push(`${sel} at ${box(r)}: its text runs out of its box at ${spill.map(box).join(', ')}`);
                for (const [other] of texts) {
                  const o = other === sel ? null : document.querySelector(other);
                  if (!o || !shown(o)) continue;
                  const q = seen(o);
                  if (sel < other && v.left < q.right && q.left < v.right && v.top < q.bottom - 1 && q.top < v.bottom - 1) problems.push(`${sel} at ${box(v)} overlaps ${other} at ${box(q)}`);
                }
                // nothing lies over it: what the screen shows near its first line's start and at its middle is e itself
                for (const [x, y] of [[v.left + 8, v.top + 8], [(v.left + v.right) / 2, (v.top + v.bottom) / 2]]) {
                  if (v.width < 16 || v.height < 16 || x < 0 || y < 0 || x > W || y > H) continue;
                  const top = document.elementFromPoint(x, y);
                  if (top && !e.contains(top) && !top.contains(e)) problems.push(`${sel} covered at ${Math.round(x)},${Math.round(y)} by ${top.tagName.toLowerCase()}.${[...top.classList].join('.')}`);
                }
                const cut = clipped(e);
                if (cut) problems.push(`${sel} text cut off (${cut}): "${t}"`);
                if (pr && v.left < pr.right && pr.left < v.right && v.top < pr.bottom && pr.top < v.bottom && !e.contains(p) && !p.contains(e))
                  problems.push(`${sel} at ${box(v)} overlaps the phase at ${box(pr)}`);
                if (wall && smallest(e) < minFont) problems.push(`${sel} text ${smallest(e)} px < ${minFont} px`);
              }
              if (touch) {
                for (const c of document.querySelectorAll('button, a[href], [role=button], input:not([type=hidden]), select, textarea')) {
                  if (!shown(c) || c.closest('[aria-hidden=true]')) continue;
                  const r = c.getBoundingClientRect();
                  if (r.width < minTarget - 0.5 || r.height < minTarget - 0.5)
                    problems.push(`control "${(c.innerText || c.getAttribute('aria-label') || c.outerHTML.slice(0, 60)).trim().slice(0, 40)}" ${Math.round(r.width)}×${Math.round(r.height)} px < ${minTarget} px`);
                }
              }
              return problems;
            }
            """, new object[] { phase, texts.Select(t => new[] { t.Selector, t.Words }).ToArray(), wall, touch, WallMinFontPx, MinTargetPx, (inView ?? []).ToArray() });
        return [.. report.EnumerateArray().Select(p => $"{where}: {p.GetString()}")];
    }

    /// <summary>
    /// What a person cannot reach on <paramref name="page"/> as it is now: the lowest text of the page's <c>main</c> must be on
    /// the screen or reachable by scrolling (every box that clips it scrolls: overflow auto or scroll, the page itself
    /// included), and once scrolled to it must not lie under anything (the safety line, a banner). Text cut on purpose (an
    /// alarm's first lines, with "Show all") is not counted. Every scrolled box is put back afterwards.
    /// </summary>
    public static async Task<IReadOnlyList<string>> ContentReachableAsync(IPage page, string where)
    {
        var report = await page.EvaluateAsync<JsonElement>("""
            () => {
              const main = document.querySelector('main');
              if (!main) return ['no main element'];
              const shown = e => { const s = getComputedStyle(e); const r = e.getBoundingClientRect(); return s.visibility !== 'hidden' && s.display !== 'none' && r.width > 0 && r.height > 0; };
              const hasText = x => [...x.childNodes].some(n => n.nodeType === 3 && n.textContent.trim());
              const name = x => `${x.tagName.toLowerCase()}${[...x.classList].map(c => '.' + c).join('')}`;
              const texts = [...main.querySelectorAll('*')].filter(x => shown(x) && hasText(x) && !x.closest('[data-clamped=true]'));
              if (texts.length === 0) return [];
              const lowest = texts.reduce((a, b) => b.getBoundingClientRect().bottom > a.getBoundingClientRect().bottom ? b : a);
              const what = `the lowest text (${name(lowest)} "${lowest.innerText.trim().slice(0, 40)}")`;
              const problems = [];
              const scrolled = [];
              // up from the text: a box that clips it and scrolls brings it into its own box, so from there on that box
              // is what must be reachable; a box that clips it and does not scroll hides it for good
              let subject = lowest;
              for (let a = lowest.parentElement; a; a = a.parentElement) {
                const s = getComputedStyle(a);
                if (s.overflowY === 'visible') continue;
                const page = a === document.documentElement || a === document.body;
                const bottom = page ? window.innerHeight : a.getBoundingClientRect().bottom;
                if (subject.getBoundingClientRect().bottom <= bottom + 1) continue;
                if (['auto', 'scroll'].includes(s.overflowY)) { subject = a; continue; }
                problems.push(`${what} lies below the bottom of ${name(a)}, which cuts it (overflow ${s.overflowY}): nobody can scroll to it`);
                break;
              }
              if (problems.length > 0) return problems;
              for (let a = lowest.parentElement; a; a = a.parentElement) scrolled.push([a, a.scrollTop]);
              lowest.scrollIntoView({ block: 'nearest' });
              const r = lowest.getBoundingClientRect();
              const x = r.left + Math.min(8, r.width / 2), y = (r.top + r.bottom) / 2;
              if (r.bottom > window.innerHeight + 1) problems.push(`${what} still ends at ${Math.round(r.bottom)} px below the ${window.innerHeight} px screen after scrolling to it`);
              else {
                const top = document.elementFromPoint(x, y);
                if (top && !lowest.contains(top) && !top.contains(lowest)) problems.push(`${what}, scrolled to, lies under ${name(top)} at ${Math.round(x)},${Math.round(y)}`);
              }
              for (const [a, t] of scrolled) a.scrollTop = t;
              window.scrollTo(0, 0);
              return problems;
            }
            """);
        return [.. report.EnumerateArray().Select(p => $"{where}: {p.GetString()}")];
    }
}
