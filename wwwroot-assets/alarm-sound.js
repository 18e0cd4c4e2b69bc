// Audible cue for new unacknowledged alarms, generated with the Web Audio API (no sound file).
// Muting is remembered per screen in localStorage.
let context = null;

function storageKey(screen) {
    return "opslvp.alarm-muted." + screen;
}

function audio() {
    if (context === null) {
        const Ctor = window.AudioContext || window.webkitAudioContext;
        if (!Ctor) {
            return null;
        }
        context = new Ctor();
    }
    if (context.state === "suspended") {
        // Browsers start audio suspended until a user gesture; any click on the page resumes it.
        context.resume().catch(() => { });
    }
    return context;
}

export function isMuted(screen) {
    try {
        return window.localStorage.getItem(storageKey(screen)) === "1";
    } catch {
        return false;
    }
}

export function setMuted(screen, muted) {
    try {
        if (muted) {
            window.localStorage.setItem(storageKey(screen), "1");
        } else {
            window.localStorage.removeItem(storageKey(screen));
        }
    } catch {
        // storage unavailable (private mode): the choice lasts for this page only
    }
    if (!muted) {
        audio();
    }
}

// Whether the browser really lets this page play sound now (an untouched kiosk usually may not).
export function soundAllowed() {
    const ctx = audio();
    return ctx !== null && ctx.state === "running";
}

// Tells the component (a DotNetObjectReference with SoundStateChanged(bool)) whenever sound becomes allowed or
// blocked; any tap or key on the page asks the browser to allow it.
export function watchSound(component) {
    const ctx = audio();
    if (ctx === null) {
        return false;
    }
    const report = () => component.invokeMethodAsync("SoundStateChanged", ctx.state === "running").catch(() => { });
    ctx.addEventListener("statechange", report);
    const gesture = () => {
        if (ctx.state !== "running") {
            ctx.resume().then(report).catch(() => { });
        }
    };
    document.addEventListener("pointerdown", gesture, { capture: true });
    document.addEventListener("keydown", gesture, { capture: true });
    return ctx.state === "running";
}

// Three two-tone pulses, about 1.2 s in all.
export function chime() {
    const ctx = audio();
    if (ctx === null) {
        return false;
    }
    const start = ctx.currentTime + 0.02;
    for (let i = 0; i < 3; i++) {
        [880, 660].forEach((frequency, j) => {
            const t = start + i * 0.4 + j * 0.16;
            const osc = ctx.createOscillator();
            const gain = ctx.createGain();
            osc.type = "sine";
            osc.frequency.value = frequency;
            gain.gain.setValueAtTime(0.0001, t);
            gain.gain.exponentialRampToValueAtTime(0.35, t + 0.02);
            gain.gain.exponentialRampToValueAtTime(0.0001, t + 0.15);
            osc.connect(gain).connect(ctx.destination);
            osc.start(t);
            osc.stop(t + 0.16);
        });
    }
    return ctx.state === "running";
}
