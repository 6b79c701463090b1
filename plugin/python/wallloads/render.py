"""Pictures of the report, rendered by ParaView (render and line chart views).

Rendering needs an X display on this platform (pvbatch crashes on the first
render without one); `available()` says whether one is there.  Under
`mpirun` every rank renders its piece and ParaView composites the image.
"""
import math
import os

__all__ = ["available", "surface", "line_chart"]

WHITE = [1.0, 1.0, 1.0]
INK = [0.1, 0.1, 0.1]


def available():
    return bool(os.environ.get("DISPLAY"))


def _white(view):
    if hasattr(view, "UseColorPaletteForBackground"):
        view.UseColorPaletteForBackground = 0
    view.Background = WHITE
    if hasattr(view, "BackgroundColorMode"):
        view.BackgroundColorMode = "Single Color"


def _direction_text(d):
    return "(%s)" % ", ".join("%.3g" % (x + 0.0) for x in d)


def surface(simple, source, time, direction, path, size, bounds):
    """The walls coloured by Directional Traction (a diverging map centred on
    zero), with a titled colour legend, in an isometric view.  Returns False
    (and draws nothing) when the walls carry no Directional Traction."""
    if source.GetCellDataInformation().GetArray("Directional Traction") is None:
        return False
    view = simple.CreateView("RenderView")
    try:
        view.ViewSize = list(size)
        view.ViewTime = time
        _white(view)
        view.OrientationAxesVisibility = 1
        view.OrientationAxesLabelColor = INK
        shown = simple.Show(source, view)
        simple.ColorBy(shown, ("CELLS", "Directional Traction"))
        lut = simple.GetColorTransferFunction("Directional Traction")
        lut.ApplyPreset("Cool to Warm", True)
        rng = source.GetCellDataInformation().GetArray("Directional Traction").GetRange(0)
        top = max(abs(rng[0]), abs(rng[1])) or 1.0
        lut.RescaleTransferFunction(-top, top)
        lut.AutomaticRescaleRangeMode = "Never"
        shown.SetScalarBarVisibility(view, True)
        bar = simple.GetScalarBar(lut, view)
        bar.Title = "Traction along %s [Pa]" % _direction_text(direction)
        bar.ComponentTitle = ""
        bar.TitleColor = INK
        bar.LabelColor = INK
        bar.TitleFontSize = 14
        bar.LabelFontSize = 12
        bar.WindowLocation = "Any Location"
        bar.Orientation = "Vertical"
        bar.Position = [0.86, 0.08]
        bar.ScalarBarLength = 0.7
        bar.RangeLabelFormat = "%-#.3g"
        xmin, xmax, ymin, ymax, zmin, zmax = bounds
        centre = [(xmin + xmax) / 2, (ymin + ymax) / 2, (zmin + zmax) / 2]
        radius = 0.5 * math.sqrt((xmax - xmin) ** 2 + (ymax - ymin) ** 2 + (zmax - zmin) ** 2) or 1.0
        iso = [1.0, -1.2, 0.8]
        norm = math.sqrt(sum(c * c for c in iso))
        view.CameraFocalPoint = centre
        view.CameraPosition = [centre[k] + 3.2 * radius * iso[k] / norm for k in range(3)]
        view.CameraViewUp = [0.0, 0.0, 1.0]
        view.CameraViewAngle = 30
        simple.Render(view)
        simple.SaveScreenshot(path, view, ImageResolution=list(size))
    finally:
        simple.Delete(view)
    return True


def line_chart(simple, table_port, x_column, series, path, size, title, x_title, y_title):
    """A line chart of table columns against one column, with a legend naming
    each series, a chart title and axis titles."""
    view = simple.CreateView("XYChartView")
    try:
        view.ViewSize = list(size)
        view.ChartTitle = title
        view.LeftAxisTitle = y_title
        view.BottomAxisTitle = x_title
        view.ShowLegend = 1
        view.LegendLocation = "TopRight"
        shown = simple.Show(table_port, view)
        shown.AttributeType = "Row Data"
        shown.UseIndexForXAxis = 0
        shown.XArrayName = x_column
        shown.SeriesVisibility = list(series)
        labels = []
        for name in series:
            labels += [name, name]
        shown.SeriesLabel = labels
        widths = []
        for name in series:
            widths += [name, "2"]
        shown.SeriesLineThickness = widths
        simple.Render(view)
        simple.SaveScreenshot(path, view, ImageResolution=list(size))
    finally:
        simple.Delete(view)
