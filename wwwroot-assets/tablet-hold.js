// The tablet's cards keep their places while a finger is on them; scrolling the page ends that hold
// (TabletCards in src/OpsLvp.Web/Components/Pages/Actions). Capture on the document sees the scroll of any
// scrolling element, not only the window's. At most one call every 300 ms.
export function watch(page) {
    let last = 0;
    const onScroll = () => {
        const now = Date.now();
        if (now - last < 300) {
            return;
        }
        last = now;
        page.invokeMethodAsync('Scrolled').catch(() => { });
    };
    document.addEventListener('scroll', onScroll, { passive: true, capture: true });
    return { stop: () => document.removeEventListener('scroll', onScroll, { capture: true }) };
}
