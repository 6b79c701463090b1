"""report.html of the demo case opened in headless Chromium (Debian's
`chromium`): every picture decodes (checked in the DOM after load by a probe
script added to a copy of the page; the report itself has no script), the
tables render, nothing is fetched from outside the page, and a screenshot of
the page is not blank.  The pictures are rendered by ParaView under the
launcher's private Xvfb when there is no display."""
import os
import re
import shutil
import subprocess

import report_testing as R

W = R.workdir("html")
chromium = shutil.which("chromium") or shutil.which("chromium-browser")
R.expect("chromium is installed (scripts/install-deps.sh)", chromium is not None)
config = os.path.join(R.SOURCE, "examples", "report.toml")
out = os.path.join(W, "out")
code, _, err = R.run(["--config", config, "-o", out, "--images", "yes"] if os.environ.get("DISPLAY") else
                     ["--config", config, "-o", out])
R.expect("demo report with the example config: exit 0", code == 0, err[-1500:] if code else "")
page = os.path.join(out, "bead", "report.html")
with open(page) as handle:
    html = handle.read()
images = re.findall(r"<img [^>]*>", html)
R.expect("report.html embeds its pictures (%d)" % len(images), len(images) >= 1
         and all('src="data:image/png;base64,' in i for i in images))
R.expect("report.html loads nothing from outside", not re.search(r'(src|href)="(https?:|//)', html))
R.expect("report.html has no script", "<script" not in html)

probe = os.path.join(W, "probe.html")
script = """<script>
window.addEventListener('load', function () {
  var imgs = document.getElementsByTagName('img');
  for (var i = 0; i < imgs.length; i++) {
    imgs[i].setAttribute('data-loaded', (imgs[i].complete && imgs[i].naturalWidth > 0) ? 'yes' : 'no');
    imgs[i].setAttribute('data-width', imgs[i].naturalWidth);
  }
  document.body.setAttribute('data-probed', imgs.length);
});
</script></body>"""
with open(probe, "w") as handle:
    handle.write(html.replace("</body>", script))
flags = [chromium, "--headless", "--no-sandbox", "--disable-gpu", "--hide-scrollbars", "--virtual-time-budget=5000"]
dom = subprocess.run(flags + ["--dump-dom", "file://" + probe], capture_output=True, text=True, timeout=120).stdout
R.expect("Chromium ran the probe after load", 'data-probed="%d"' % len(images) in dom, dom[-300:])
states = re.findall(r'data-loaded="(\w+)"', dom)
widths = [int(w) for w in re.findall(r'data-width="(\d+)"', dom)]
R.expect("every picture loaded in Chromium (%d of %d)" % (states.count("yes"), len(images)),
         len(states) == len(images) and all(s == "yes" for s in states), states)
R.expect("pictures have their rendered width", all(w >= 100 for w in widths), widths)
R.expect("the loads table rendered with its Total row", dom.count("<table") >= 3 and ">Total<" in dom)

shot = os.path.join(W, "report.png")
subprocess.run(flags + ["--window-size=1200,2600", "--screenshot=" + shot, "file://" + page], capture_output=True,
               timeout=120)
R.expect("screenshot written", os.path.exists(shot) and os.path.getsize(shot) > 20000,
         os.path.getsize(shot) if os.path.exists(shot) else 0)
from vtkmodules.vtkIOImage import vtkPNGReader
from vtkmodules.util.numpy_support import vtk_to_numpy
reader = vtkPNGReader()
reader.SetFileName(shot)
reader.Update()
pixels = vtk_to_numpy(reader.GetOutput().GetPointData().GetScalars()).astype(float)
R.expect("screenshot is not blank (pixel spread %.1f)" % pixels.std(), pixels.std() > 10)
R.done(__file__)
