"""The first minutes of a new user, in the real ParaView window.

    scripts/with-xvfb.sh python3 tests/gui/gui_user.py

Starts the ParaView application on the private X display of with-xvfb.sh
(plugin loaded from PV_PLUGIN_PATH, as a user installs it; a fresh settings
folder with the welcome dialog turned off) and drives it with xdotool only,
as a user does with keyboard and mouse:

surface path: File > Open the demo bead, Apply (Alt+A); Wall Traction and
Load Integration from the quick-launch search (Ctrl+Space, Shift+Enter:
create and apply with the defaults); the Load Summary opens in a spreadsheet
view; then the reference values are typed into Wall Traction's panel (found
with the panel's search box), once.

volume path (Edit > Reset Session): open the fluid volume and the bead, Apply;
Shear Projection from the quick-launch search on the volume, its viscosity
typed in, the bead picked as its Walls (Edit > Change Input); Wall Traction
and Load Integration with the defaults plus the reference pressure and load
direction.

The outcome is read from the application itself: tests/gui/gui_probe.py runs
inside ParaView and records, after every pipeline update and render, the
sources, their inputs and properties, the Load Integration tables and what
every view shows (the spreadsheet's columns in display order). Every step
waits on a condition of that state or of the windows, never on a fixed
delay. The loads must equal those of the same chains scripted with explicit
settings (tests/gui/gui_reference.py, pvpython) to 1e-9 and the exact Stokes
loads of the demo within the mesh error; screenshots (in the test output
folder) must show the bead in the render view and the table beside it.
Prints PASS/FAIL lines; exit status 0 on success.
"""
import json
import math
import os
import re
import shutil
import subprocess
import sys
import tempfile
import time

SRC = os.environ["WALLLOADS_SOURCE_DIR"]
DEMO = os.path.join(SRC, "examples", "demo")
OUT = os.path.join(os.environ.get("WALLLOADS_TEST_OUTPUT", tempfile.gettempdir()), "gui_user")
HERE = os.path.dirname(os.path.abspath(__file__))
EXACT = json.load(open(os.path.join(DEMO, "analytic.json")))
PAR = EXACT["parameters"]
SCREEN = (1280, 1024)
RENDER_BACKGROUND = (84, 89, 109)  # ParaView 5.11's default render view background


class Failure(Exception):
    pass


failures = []


def check(label, ok, detail=""):
    print("%-72s %s %s" % (label, "ok" if ok else "FAILED", detail), flush=True)
    if not ok:
        failures.append(label)


def run(*args, check_rc=True):
    proc = subprocess.run(args, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    if check_rc and proc.returncode != 0:
        raise Failure("%s failed: %s" % (" ".join(args), proc.stderr.strip()))
    return proc.stdout


def xdo(*args):
    return run("xdotool", *[str(a) for a in args])


def wait_for(what, condition, timeout=90.0):
    """Poll `condition` until it returns a true value; fail after `timeout` s."""
    deadline = time.monotonic() + timeout
    while True:
        value = condition()
        if value:
            return value
        if time.monotonic() > deadline:
            raise Failure("timed out after %.0f s waiting for %s" % (timeout, what))
        time.sleep(0.1)


class App:
    """The ParaView application, its main window and the recorded state."""

    def __init__(self):
        self.home = tempfile.mkdtemp(prefix="wallloads_gui_home_")
        config = os.path.join(self.home, ".config", "ParaView")
        os.makedirs(config)
        with open(os.path.join(config, "ParaView5.11.0.ini"), "w") as handle:
            # A user's choices: no welcome dialog; the Output Messages window
            # does not pop up (the test reads ParaView's log instead).
            handle.write("[General]\nGeneralSettings.ShowWelcomeDialog=false\n"
                         "OutputMessages.AlwaysOpenForNewMessages=false\n")
        self.state_path = os.path.join(OUT, "state.json")
        self.log_path = os.path.join(OUT, "paraview.log")
        if os.path.exists(self.state_path):
            os.remove(self.state_path)
        env = dict(os.environ, HOME=self.home, WALLLOADS_GUI_STATE=self.state_path,
                   PV_PLUGIN_PATH=os.path.dirname(os.environ["WALLLOADS_PLUGIN"]),
                   XDG_RUNTIME_DIR=self.home)
        self.log = open(self.log_path, "w")
        self.proc = subprocess.Popen(["paraview", "--script=" + os.path.join(HERE, "gui_probe.py")],
                                     env=env, stdout=self.log, stderr=subprocess.STDOUT)
        self.window = wait_for("the ParaView main window", lambda: self.find_window(r"^ParaView 5"), 120)
        xdo("windowsize", "--sync", self.window, *SCREEN)
        wait_for("the probe's first snapshot", lambda: self.state(), 60)
        self.seq = 0

    def find_window(self, pattern):
        if self.proc.poll() is not None:
            raise Failure("ParaView exited (status %s); see %s" % (self.proc.returncode, self.log_path))
        ids = run("xdotool", "search", "--onlyvisible", "--name", pattern, check_rc=False).split()
        return ids[0] if ids else None

    def state(self):
        try:
            with open(self.state_path) as handle:
                return json.load(handle)
        except (OSError, ValueError):
            return None

    def when(self, what, condition, timeout=90.0):
        """Wait for a snapshot newer than the last action that satisfies `condition`."""
        def test():
            s = self.state()
            if s is None or s.get("seq", 0) <= self.seq:
                return None
            if s.get("error"):
                raise Failure("probe error: " + s["error"])
            return s if condition(s) else None
        s = wait_for(what, test, timeout)
        return s

    def mark(self):
        s = self.state()
        self.seq = s["seq"] if s else 0

    def dismiss_messages(self):
        """Close the Output Messages window (its title-bar close button) if
        it popped up: ParaView raises it for every error (Shear Projection
        still reports some on creation), and it takes the keyboard."""
        box = self.find_window(r"^Output Messages$")
        if box:
            geo = dict(line.split("=") for line in run("xdotool", "getwindowgeometry", "--shell", box).split())
            xdo("mousemove", int(geo["X"]) + int(geo["WIDTH"]) - 10, int(geo["Y"]) + 9, "click", 1)
            self.gone(box)

    def focus(self, window=None):
        xdo("windowfocus", "--sync", window or self.window)

    def keys(self, *keys, window=None):
        self.focus(window)
        xdo("key", *keys)

    def type(self, text):
        xdo("type", "--delay", 15, text)

    def dialog(self, pattern):
        return wait_for("the '%s' window" % pattern, lambda: self.find_window(pattern), 30)

    def gone(self, window):
        wait_for("window %s to close" % window,
                 lambda: window not in run("xdotool", "search", "--onlyvisible", "--name", "", check_rc=False).split(), 30)

    def open_file(self, path):
        self.keys("ctrl+o")
        box = self.dialog(r"^Open File")
        self.focus(box)
        self.type(path)
        xdo("key", "Return")
        self.gone(box)

    def apply_pending(self, shot):
        return colour_fraction(shot, (0, 440, 280, 120), (186, 236, 183), 6) >= 0.02

    def apply(self):
        """Click the Properties panel's Apply button once it is green (modified)."""
        self.mark()

        def green_button():
            shot = self.screenshot("_apply")
            if not self.apply_pending(shot):
                return None
            box = run("convert", shot, "-crop", "280x120+0+440", "+repage", "-fuzz", "6%", "-fill", "black",
                      "+opaque", "#BAECB7", "-format", "%@", "info:")  # bounding box of the green
            m = re.match(r"(\d+)x(\d+)\+(\d+)\+(\d+)", box)
            return m and tuple(int(v) for v in m.groups())
        w, h, x, y = wait_for("the Apply button to turn green", green_button, 30)
        xdo("mousemove", x + w // 2, 440 + y + h // 2, "click", 1)

    def quick_launch(self, text, apply=True):
        """Ctrl+Space, type, Shift+Enter (create and apply) or Enter (create)."""
        self.dismiss_messages()
        self.mark()
        self.keys("ctrl+space")
        wait_for("the quick-launch dialog", lambda: run("xdotool", "getwindowfocus").strip() != self.window, 30)
        self.type(text)
        xdo("key", "shift+Return" if apply else "Return")

    def settle(self, box=(0, 130, 300, 894)):
        """Wait until the region (the pipeline browser and properties panel by
        default) stops changing: ParaView rebuilds the panel after a
        selection, asynchronously."""
        x, y, w, h = box
        crop = "%dx%d+%d+%d" % (w, h, x, y)
        previous = [None]

        def still():
            shot = self.screenshot("_settle")
            now = run("convert", shot, "-crop", crop, "+repage", "-format", "%#", "info:").strip()
            same = now == previous[0]
            previous[0] = now
            return same
        wait_for("the panel to settle", still, 30)

    def set_property(self, xml, prop, search, values):
        """Type values into the first field that the panel's search box shows
        for `search`, Apply, and wait until `prop` of the `xml` filter holds
        them (the search also matches documentation: the check catches a
        value typed into the wrong field)."""
        self.dismiss_messages()
        self.mark()
        self.settle()
        box = self.find_white_band(15, 250, 500, 600)  # the panel's search box
        if box is None:
            raise Failure("properties panel search box not found")
        xdo("mousemove", 200, box, "click", 1)
        xdo("key", "Escape")  # the search box clears on Esc
        self.type(search)
        self.settle()
        field = wait_for("the '%s' field" % search, lambda: self.find_white_band(150, 250, box + 20, 900), 30)
        # The first component's field: the leftmost white pixel of that row.
        text = run("convert", os.path.join(OUT, "_panel.png"), "-crop", "200x1+90+%d" % field, "+repage", "txt:-")
        xs = [int(m.group(1)) for m in re.finditer(r"^(\d+),0:.*#FFFFFF\b", text, re.M)]
        if not xs:
            raise Failure("no text field in the row of '%s'" % search)
        xdo("mousemove", 90 + min(xs) + 6, field, "click", 1)
        for i, value in enumerate(values):
            if i:
                xdo("key", "Tab")
            # Clear the field without modifier keys (End, then BackSpace).
            xdo("key", "End", *(["BackSpace"] * 24))
            self.type(str(value))
        xdo("mousemove", 200, box, "click", 1)
        xdo("key", "Escape")
        self.apply()

        def landed(s):
            value = (source(s, xml) or {}).get("properties", {}).get(prop)
            value = value if isinstance(value, list) else [value]
            try:
                return [float(v) for v in value] == [float(v) for v in values]
            except (TypeError, ValueError):
                return False
        return self.when("%s.%s = %s" % (xml, prop, values), landed, 30)

    def confirm(self, before):
        """Press the default button of the dialog that opened since `before` (window ids)."""
        def new_window():
            now = run("xdotool", "search", "--onlyvisible", "--name", "", check_rc=False).split()
            fresh = [w for w in now if w not in before]
            return fresh[0] if fresh else None
        dialog = wait_for("a confirmation dialog", new_window, 30)
        self.keys("Return", window=dialog)
        self.gone(dialog)

    def screenshot(self, name):
        path = os.path.join(OUT, name + ".png")
        run("import", "-window", "root", path)
        return path

    def find_white_band(self, x0, x1, y0, y1, min_height=10, min_fraction=0.35):
        """Centre row of the first band of rows that are mostly pure white
        between x0 and x1: a text field (the panel's background is grey)."""
        shot = self.screenshot("_panel")
        text = run("convert", shot, "-crop", "%dx%d+%d+%d" % (x1 - x0, y1 - y0, x0, y0), "+repage",
                   "-fill", "black", "+opaque", "#FFFFFF", "-colorspace", "Gray",
                   "-scale", "1x%d!" % (y1 - y0), "txt:-")
        rows = [int(m.group(1)) for m in re.finditer(r"^0,\d+:\s*\((\d+)", text, re.M)]
        full = 65535 if max(rows or [0]) > 255 else 255
        band = []
        for y, value in enumerate(rows + [0]):
            if value >= min_fraction * full:
                band.append(y)
            else:
                if len(band) >= min_height:
                    return y0 + (band[0] + band[-1]) // 2
                band = []
        return None

    def quit(self):
        if self.proc.poll() is None:
            self.proc.terminate()
            try:
                self.proc.wait(30)
            except subprocess.TimeoutExpired:
                self.proc.kill()
        self.log.close()
        shutil.rmtree(self.home, ignore_errors=True)


def colour_fraction(path, box, colour, fuzz=8):
    """Fraction of the pixels in box (x, y, w, h) within `fuzz` % of `colour`."""
    x, y, w, h = box
    hexcol = "#%02X%02X%02X" % colour
    out = run("convert", path, "-crop", "%dx%d+%d+%d" % (w, h, x, y), "+repage", "-fuzz", "%d%%" % fuzz,
              "-fill", "black", "-opaque", hexcol, "-fill", "white", "+opaque", "black",
              "-colorspace", "Gray", "-format", "%[fx:1-mean]", "info:")
    return float(out)


def source(state, xml, nth=0):
    found = [s for s in state["sources"] if s["xml"] == xml]
    return found[nth] if len(found) > nth else None


def summary_of(state, xml="LoadIntegration"):
    li = source(state, xml)
    return li and li.get("load_summary") and li["load_summary"]["values"]


def sheet_showing(state, name, port):
    for v in state["views"]:
        if v["type"] == "SpreadSheetView" and [name, port] in v["shows"] and v.get("rows"):
            return v
    return None


def rel(a, b):
    return abs(a - b) / max(abs(b), 1e-300)


def region_rows(summary):
    return {name: i for i, name in enumerate(summary["Boundary"])}


def compare_to_reference(label, summary, table, ref, columns):
    """The GUI's Load Summary (and Load Table) against the scripted chain, to 1e-9."""
    rows = region_rows(summary)
    worst = 0.0
    for region, row in ref.items():
        for col, key in columns:
            got = summary[col][rows[region]]
            want = row[key]
            worst = max(worst, abs(got - want) / max(abs(want), 1e-30))
    check("%s: Load Summary equals the scripted chain (all regions)" % label, worst < 1e-9,
          "max rel diff %.2e" % worst)
    tab_rows = {n: i for i, n in enumerate(table["Region"])}
    force = table["Force"][tab_rows["Total"]]
    want = ref["Total"]["Force"]
    diff = max(abs(a - b) for a, b in zip(force, want)) / max(abs(w) for w in want)
    check("%s: Load Table Total Force equals the scripted chain" % label, diff < 1e-9, "rel %.2e" % diff)


def surface_path(app, ref):
    t0 = time.monotonic()
    app.mark()
    app.open_file(os.path.join(DEMO, "bead.vtm"))
    app.apply()
    app.when("the bead read", lambda s: (source(s, "XMLMultiBlockDataReader") or {}).get("cells", 0) > 0)
    app.quick_launch("wall tr")
    s = app.when("Wall Traction applied", lambda s: (source(s, "WallTraction") or {}).get("cells", 0) > 0)
    wt = source(s, "WallTraction")
    check("surface: Wall Traction found in the quick launch, input the bead", wt["inputs"]["Input"] == ["bead.vtm"])
    # (What Automatic found is proved below: the loads equal those of the
    # chain scripted with 'static_pressure' and 'wall_shear'.)
    check("surface: Pressure, Shear Source and Orientation left at Automatic",
          wt["properties"]["Pressure"][-1] == "Automatic" and wt["properties"]["ShearSource"] == ["Automatic"]
          and wt["properties"]["Orientation"] == ["Automatic"], str({k: wt["properties"][k] for k in
                                                                    ("Pressure", "ShearSource", "Orientation")}))
    app.quick_launch("load int")
    s = app.when("Load Integration applied and its summary in a spreadsheet",
                 lambda s: summary_of(s) and sheet_showing(s, source(s, "LoadIntegration")["name"], 2))
    li = source(s, "LoadIntegration")
    sheet = sheet_showing(s, li["name"], 2)
    labels = sheet["labels"]
    check("surface: the spreadsheet opened on Apply shows the Load Summary (port 2)", sheet is not None)
    check("surface: one spreadsheet only (the full table stays closed)",
          sum(1 for v in s["views"] if v["type"] == "SpreadSheetView") == 1)
    check("surface: region column first, then drag and lift (display order)",
          labels[:4] == ["Row ID", "Boundary", "Drag [N]", "Lift [N]"], str(labels[:5]))
    check("surface: every load column shows its unit",
          all("[" in l for l in labels[2:] if "Coefficient" not in l), str(labels))
    summary = li["load_summary"]["values"]
    check("surface: rows are the three wall regions and Total",
          summary["Boundary"] == ["Upper Cap", "Equator Band", "Lower Cap", "Total"], str(summary["Boundary"]))
    total_row = [summary[c][-1] for c in li["load_summary"]["columns"] if c != "Boundary"]
    check("surface: the Total row holds numbers only (no nan)",
          all(isinstance(v, float) and math.isfinite(v) for v in total_row))
    exact_total = EXACT["regions"]["Total"]["total_force"][2]
    lift = summary["Lift [N]"][-1]
    # Defaults: drag along x, lift along z (the settling axis): the total is a lift.
    check("surface, defaults only: total load along z within 0.5 %% of the exact %.4e N" % exact_total,
          rel(lift, exact_total) < 5e-3, "got %.6e (faceted 36 x 72 sphere, 0.2 %% measured)" % lift)
    app.settle((0, 0) + SCREEN)
    shot = app.screenshot("surface_defaults")
    t1 = time.monotonic()

    # The reference values, typed once into Wall Traction's panel.
    app.mark()
    xdo("mousemove", 90, 219, "click", 1)  # WallTraction1 in the pipeline browser (third row)
    app.when("Wall Traction active", lambda s: s.get("active") == "WallTraction1")
    app.set_property("WallTraction", "ReferencePressure", "reference pressure", [PAR["p_inf"]])
    app.set_property("WallTraction", "LoadDirection", "load direction", [0, 0, 1])
    app.set_property("WallTraction", "Density", "reference density", [PAR["density"]])
    app.set_property("WallTraction", "ReferenceSpeed", "reference speed", [PAR["stream_velocity"][2]])
    s = app.when("the reference values applied and the table updated",
                 lambda s: (summary_of(s) or {}).get("Drag Coefficient") is not None)
    li = source(s, "LoadIntegration")
    wtp = source(s, "WallTraction")["properties"]
    check("surface: reference values typed into Wall Traction",
          wtp["ReferencePressure"] == PAR["p_inf"] and [float(v) for v in wtp["LoadDirection"]] == [0, 0, 1]
          and wtp["Density"] == PAR["density"], str({k: wtp[k] for k in ("ReferencePressure", "LoadDirection", "Density", "ReferenceSpeed")}))
    summary = li["load_summary"]["values"]
    table = li["load_table"]["values"]
    rows = region_rows(summary)
    q = 0.5 * PAR["density"] * PAR["stream_velocity"][2] ** 2
    check("surface: Load Integration took density and speed from Wall Traction (q in the table)",
          rel(summary["Dynamic Pressure [Pa]"][-1], q) < 1e-12 and rel(table["Reference Density"][0], PAR["density"]) < 1e-12,
          "q = %.6e Pa" % summary["Dynamic Pressure [Pa]"][-1])
    check("surface: drag direction from Wall Traction's Load Direction",
          table["Drag Direction"][0] == [0.0, 0.0, 1.0], str(table["Drag Direction"][0]))
    for region in ("Upper Cap", "Equator Band", "Lower Cap", "Total"):
        want = EXACT["regions"][region]["total_force"][2]
        got = summary["Drag [N]"][rows[region]]
        check("surface: %-12s drag within 0.5 %% of the exact Stokes load" % region, rel(got, want) < 5e-3,
              "%.6e vs %.6e (%.2f %%)" % (got, want, 100 * rel(got, want)))
    compare_to_reference("surface", summary, table, ref["surface"],
                         [("Drag [N]", "Drag"), ("Lift [N]", "Lift"), ("Side Force [N]", "Side Force"),
                          ("Rolling Moment [N m]", "Rolling Moment"), ("Drag Coefficient", "Drag Coefficient"),
                          ("Wetted Area [m^2]", "Area")])
    app.settle((0, 0) + SCREEN)  # the picture of the final state, painted
    shot = app.screenshot("surface_table")
    check("surface: nothing left to apply (Apply button not green)", not app.apply_pending(shot))
    layout = (300, 190, SCREEN[0] - 300, 780)
    left = (layout[0], layout[1], layout[2] // 2, layout[3])
    right = (layout[0] + layout[2] // 2, layout[1], layout[2] // 2, layout[3])
    bg_left = colour_fraction(shot, left, RENDER_BACKGROUND)
    white_right = colour_fraction(shot, right, (255, 255, 255), fuzz=3)
    check("surface screenshot: render view on the left with the bead on it", 0.5 < bg_left < 0.97,
          "background %.0f %%" % (100 * bg_left))
    check("surface screenshot: the table fills the right half", white_right > 0.5,
          "white %.0f %%" % (100 * white_right))
    print("surface path: defaults in %.1f s, reference values in %.1f s" % (t1 - t0, time.monotonic() - t1))


def volume_path(app, ref):
    t0 = time.monotonic()
    app.mark()
    before = run("xdotool", "search", "--onlyvisible", "--name", "", check_rc=False).split()
    app.keys("ctrl+r")  # Edit > Reset Session, and Yes
    app.confirm(before)
    app.when("an empty session", lambda s: not s["sources"])
    app.open_file(os.path.join(DEMO, "bead_volume.vtu"))
    app.open_file(os.path.join(DEMO, "bead.vtm"))
    app.apply()
    app.when("both files read", lambda s: all(x.get("cells", 0) > 0 for x in s["sources"]) and len(s["sources"]) == 2)
    app.mark()
    xdo("mousemove", 110, 197, "click", 1)  # bead_volume.vtu, first row under builtin:
    app.when("the volume active", lambda s: s.get("active") == "bead_volume.vtu")
    app.quick_launch("shear")
    s = app.when("Shear Projection applied", lambda s: (source(s, "ShearProjection") or {}).get("cells", 0) > 0)
    app.set_property("ShearProjection", "Viscosity", "viscosity", [PAR["dynamic_viscosity"]])
    # Pick the walls: Edit > Change Input..., port Walls, the bead.
    app.dismiss_messages()
    app.mark()
    app.keys("alt+e")
    xdo("key", "i")
    box = app.dialog(r"^Change Input")
    geo = dict(line.split("=") for line in run("xdotool", "getwindowgeometry", "--shell", box).split())
    x, y = int(geo["X"]), int(geo["Y"])
    xdo("mousemove", x + 20, y + 74, "click", 1)    # the 'Walls' port
    xdo("mousemove", x + 230, y + 91, "click", 1)   # bead.vtm, third row of the pipeline there
    xdo("mousemove", x + 362, y + 376, "click", 1)  # OK
    app.gone(box)
    # (ParaView re-executes the filter on its new input without an Apply.)
    s = app.when("Shear Projection on the bead walls",
                 lambda s: source(s, "ShearProjection")["inputs"].get("Walls") == ["bead.vtm"]
                 and source(s, "ShearProjection").get("cells", 0) == 2592)
    check("volume: Walls picked in the Change Input dialog", True)
    # ParaView 5.11 refreshes which filters apply to the selection when the
    # selection changes, not when a filter re-executes on a new input: as a
    # user does, click another item, then Shear Projection again.
    app.settle()
    app.mark()
    xdo("mousemove", 80, 240, "click", 1)   # bead.vtm (fourth row)
    app.when("the bead active", lambda s: s.get("active") == "bead.vtm")
    app.mark()
    xdo("mousemove", 110, 284, "click", 1)  # ShearProjection1 under it (sixth row)
    app.when("Shear Projection active", lambda s: s.get("active") == "ShearProjection1")
    app.quick_launch("wall tr")
    s = app.when("Wall Traction applied", lambda s: (source(s, "WallTraction") or {}).get("cells", 0) > 0)
    wt = source(s, "WallTraction")
    check("volume: Wall Traction left at its defaults (Automatic: 'Wall Shear Stress', the Wall Normal array)",
          wt["properties"]["ShearSource"] == ["Automatic"] and wt["properties"]["Orientation"] == ["Automatic"])
    app.set_property("WallTraction", "ReferencePressure", "reference pressure", [PAR["p_inf"]])
    app.set_property("WallTraction", "LoadDirection", "load direction", [0, 0, 1])
    app.quick_launch("load int")
    s = app.when("Load Integration and its summary",
                 lambda s: summary_of(s) and sheet_showing(s, source(s, "LoadIntegration")["name"], 2)
                 and source(s, "WallTraction")["properties"]["LoadDirection"][-1] in ("1.0", "1"))
    li = source(s, "LoadIntegration")
    summary = li["load_summary"]["values"]
    table = li["load_table"]["values"]
    # The scripted chain names 'Wall Shear Stress' and 'Use Wall Normal array':
    # equal loads prove what the defaults chose.
    compare_to_reference("volume", summary, table, ref["volume"],
                         [("Drag [N]", "Drag"), ("Lift [N]", "Lift"), ("Rolling Moment [N m]", "Rolling Moment"),
                          ("Wetted Area [m^2]", "Area")])
    rows = {n: i for i, n in enumerate(table["Region"])}
    fp = table["Pressure Force"][rows["Total"]][2]
    fv = table["Viscous Force"][rows["Total"]][2]
    ex = EXACT["regions"]["Total"]
    check("volume: pressure drag within 0.5 % of the exact Stokes value", rel(fp, ex["pressure_force"][2]) < 5e-3,
          "%.6e vs %.6e" % (fp, ex["pressure_force"][2]))
    # Near-wall difference is first order: 11.7 % low on this mesh
    # (tests/python/test_shear_demo_volume.py measures the order).
    check("volume: friction drag within 15 % of the exact 4 pi mu R U (first-order method)",
          rel(fv, ex["viscous_force"][2]) < 0.15, "%.6e vs %.6e (%.1f %% low)" % (
              fv, ex["viscous_force"][2], 100 * (1 - fv / ex["viscous_force"][2])))
    app.settle((0, 0) + SCREEN)
    shot = app.screenshot("volume_table")
    check("volume: nothing left to apply (Apply button not green)", not app.apply_pending(shot))
    right = (300 + (SCREEN[0] - 300) // 2, 190, (SCREEN[0] - 300) // 2, 780)
    check("volume screenshot: the table fills the right half",
          colour_fraction(shot, right, (255, 255, 255), fuzz=3) > 0.5)
    print("volume path in %.1f s" % (time.monotonic() - t0))


def main():
    os.makedirs(OUT, exist_ok=True)
    start = time.monotonic()
    ref_path = os.path.join(OUT, "reference.json")
    pvpython = os.environ.get("WALLLOADS_PVPYTHON", "pvpython")
    reference = subprocess.Popen([pvpython, os.path.join(HERE, "gui_reference.py"), ref_path],
                                 stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True)
    app = App()
    try:
        ref_out = reference.communicate(timeout=180)[0]
        if reference.returncode != 0:
            raise Failure("the scripted reference failed:\n" + ref_out)
        ref = json.load(open(ref_path))
        surface_path(app, ref)
        volume_path(app, ref)
    except Failure as err:
        app.screenshot("failure")
        failures.append(str(err))
        print("FAILED:", err)
        state = app.state()
        if state:
            print("last recorded state:", json.dumps(state)[:3000])
    finally:
        app.quit()
    log = open(app.log_path).read()
    ours = [l for l in log.splitlines() if "ERR|" in l and re.search(r"vtk(WallTraction|LoadIntegration)", l)]
    check("no error from Wall Traction or Load Integration in ParaView's log", not ours, "; ".join(ours)[:500])
    others = [l for l in log.splitlines() if "ERR|" in l and l not in ours]
    if others:
        print("other errors in ParaView's log (not ours):", len(others))
        for l in others[:5]:
            print("   ", l.strip()[:200])
    print("GUI user test: %.1f s, %d failed" % (time.monotonic() - start, len(failures)))
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
