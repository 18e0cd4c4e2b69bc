// OpsLvp connection banner: shown (non-modal, so the page stays visible under it) while the live connection
// is lost; an unattended wall keeps retrying on its own after Blazor's attempts run out.
const banner = document.getElementById("components-reconnect-modal");
banner.addEventListener("components-reconnect-state-changed", handleReconnectStateChanged);

document.getElementById("components-reconnect-button").addEventListener("click", retry);
document.getElementById("components-resume-button").addEventListener("click", resume);

const retryEveryMs = 10000;
let retryTimer = null;

function handleReconnectStateChanged(event) {
    const state = event.detail.state;
    if (state === "show" || state === "retrying" || state === "failed" || state === "paused") {
        if (!banner.open) {
            banner.show();
        }
        document.documentElement.classList.add("opslvp-disconnected");
    }
    if (state === "hide") {
        stopRetrying();
        banner.close();
        document.documentElement.classList.remove("opslvp-disconnected");
    } else if (state === "failed") {
        startRetrying();
    } else if (state === "rejected") {
        location.reload();
    }
}

function startRetrying() {
    document.addEventListener("visibilitychange", retryWhenDocumentBecomesVisible);
    if (retryTimer === null) {
        retryTimer = setInterval(retry, retryEveryMs);
    }
}

function stopRetrying() {
    document.removeEventListener("visibilitychange", retryWhenDocumentBecomesVisible);
    if (retryTimer !== null) {
        clearInterval(retryTimer);
        retryTimer = null;
    }
}

async function retry() {
    try {
        // true: reconnected; false: the server answered but no longer knows this circuit; throws: unreachable.
        const successful = await Blazor.reconnect();
        if (successful) {
            stopRetrying();
            return;
        }
        const resumed = await Blazor.resumeCircuit();
        if (!resumed) {
            location.reload();
        } else {
            stopRetrying();
            banner.close();
            document.documentElement.classList.remove("opslvp-disconnected");
        }
    } catch (err) {
        startRetrying();
    }
}

async function resume() {
    try {
        const successful = await Blazor.resumeCircuit();
        if (!successful) {
            location.reload();
        }
    } catch {
        banner.classList.replace("components-reconnect-paused", "components-reconnect-resume-failed");
    }
}

async function retryWhenDocumentBecomesVisible() {
    if (document.visibilityState === "visible") {
        await retry();
    }
}
