"""Shared plumbing of the panels: one panel base, message area, quiet updates, downloads.

Every panel is a :class:`Panel` (an ``ipywidgets.VBox``) with one :class:`MessageArea`
(class ``wb-message``), one safety caution banner (class ``wb-caution``, shown once), and
:meth:`Panel.guard` around every widget callback: a :class:`~workbench.errors.WorkbenchError`
is shown as it is, any other exception as a plain sentence (never a traceback), and the
last good result stays visible, marked stale.  :func:`quiet_update` sets widget values
without running the panel's observers, :func:`download_link` makes the one kind of
download link (a ``data:`` URL), :class:`ResultRows` shows result fields described in
:data:`workbench.fields.FIELDS`.  Entries carry the CSS class ``wb-input-<name>``, results
``wb-result-<name>`` (:func:`input_class`, :func:`result_class`).

Panels keep every value in SI units; these helpers convert to and from the display unit
system chosen with the unit switch (:data:`workbench.units.UNIT_SYSTEMS`).  Gauge pressures
are shown against a stated ambient pressure.  Text typed into a field is never evaluated.

References
----------
B. N. Taylor, A. Thompson, NIST Special Publication 811, Guide for the Use of the
International System of Units (SI), 2008 (unit names and conversion factors).
"""

from __future__ import annotations

import base64
import contextlib
import html
import math

import ipywidgets as widgets

from ..errors import WorkbenchError
from ..units import Q_, UNIT_SYSTEMS, ureg

#: Kinds of displayed quantities beyond :data:`workbench.units.SI_UNITS`:
#: ``percent`` (an efficiency shown in %), ``elevation`` (m or ft) and
#: ``absolute_pressure`` (a pressure never shown as gauge, e.g. the ambient pressure).
EXTRA_KINDS = ("percent", "elevation", "absolute_pressure")

_PRETTY = {
    "degC": "°C", "degF": "°F", "K": "K", "m**3/s": "m³/s", "m**3/h": "m³/h",
    "ft**3/min": "ft³/min", "kg/m**3": "kg/m³", "lb/ft**3": "lb/ft³", "J/(kg*K)": "J/(kg K)",
    "kJ/(kg*K)": "kJ/(kg K)", "Btu/(lb*degR)": "Btu/(lb °R)", "inch": "in", "m**2": "m²",
    "ft**2": "ft²", "": "-",
}

DEFAULT_AMBIENT = 101325.0


def _system(system):
    return UNIT_SYSTEMS[system] if isinstance(system, str) else system


def unit_of(system, kind: str) -> str:
    """Pint unit string of a displayed kind in a unit system (``"%"`` for percent)."""
    system = _system(system)
    if kind == "percent":
        return "%"
    if kind == "elevation":
        return "ft" if system.unit("length") == "inch" else "m"
    if kind == "absolute_pressure":
        return system.unit("pressure")
    return system.unit(kind)


def unit_label(system, kind: str) -> str:
    """Unit as shown beside an entry or a result (``bar(g)``, ``psig``, ``°C`` ...)."""
    system = _system(system)
    unit = unit_of(system, kind)
    if kind == "pressure" and system.gauge:
        return {"psi": "psig", "bar": "bar(g)"}.get(unit, unit + " (gauge)")
    if kind == "absolute_pressure" and system.gauge:
        return {"psi": "psia", "bar": "bar(abs)"}.get(unit, unit + " (abs)")
    return _PRETTY.get(unit, unit)


def from_si(system, value, kind: str, ambient_pressure: float = DEFAULT_AMBIENT):
    """Convert an SI value (float or array) to the display unit of ``kind``.

    Parameters
    ----------
    system : str or UnitSystem
        Display unit system.
    value : float or numpy.ndarray
        Value in SI units (fraction [-] for ``percent``).
    kind : str
        Kind of quantity (a key of ``SI_UNITS`` or one of :data:`EXTRA_KINDS`).
    ambient_pressure : float
        Ambient pressure [Pa] for gauge pressures.

    Returns
    -------
    float or numpy.ndarray
        Value in display units; NaN stays NaN, ``None`` becomes NaN.
    """
    system = _system(system)
    if value is None:
        return math.nan
    if kind == "percent":
        return value * 100.0
    if kind == "dimensionless":
        return value
    if kind == "elevation":
        return value if unit_of(system, kind) == "m" else Q_(value, "m").to("ft").magnitude
    if kind == "absolute_pressure":
        kind_unit = system.unit("pressure")
        return Q_(value, "Pa").to(kind_unit).magnitude
    if kind == "pressure" and system.gauge:
        value = value - ambient_pressure
    return _convert(value, _si_unit(kind), system.unit(kind), kind)


def to_si(system, value, kind: str, ambient_pressure: float = DEFAULT_AMBIENT):
    """Convert a display value to SI units; the inverse of :func:`from_si`."""
    system = _system(system)
    if kind == "percent":
        return value / 100.0
    if kind == "dimensionless":
        return value
    if kind == "elevation":
        return value if unit_of(system, kind) == "m" else Q_(value, "ft").to("m").magnitude
    if kind == "absolute_pressure":
        return Q_(value, system.unit("pressure")).to("Pa").magnitude
    si = _convert(value, system.unit(kind), _si_unit(kind), kind)
    if kind == "pressure" and system.gauge:
        si = si + ambient_pressure
    return si


def _si_unit(kind):
    from ..units import SI_UNITS

    return SI_UNITS[kind]


_AFFINE: dict = {}


def _convert(value, from_unit, to_unit, kind):
    """Unit conversion as ``a * value + b``, with a and b found once by pint per unit pair."""
    if from_unit == to_unit:
        return value
    key = (from_unit, to_unit)
    if key not in _AFFINE:
        if kind == "temperature":
            zero = Q_(0.0, ureg(from_unit).units).to(to_unit).magnitude
            one = Q_(1.0, ureg(from_unit).units).to(to_unit).magnitude
        else:
            zero = 0.0
            one = (1.0 * ureg(from_unit)).to(to_unit).magnitude
        _AFFINE[key] = (one - zero, zero)
    a, b = _AFFINE[key]
    return a * value + b


def format_number(value, kind: str = "") -> str:
    """Text of a displayed number: about five significant digits, no exponent.

    Efficiencies in percent get two decimals; NaN shows as an en dash.
    """
    if value is None or not isinstance(value, (int, float)) or not math.isfinite(value):
        return "–"
    if kind == "percent":
        return f"{value:.2f}"
    if value == 0:
        return "0"
    digits = max(0, 4 - int(math.floor(math.log10(abs(value)))))
    return f"{value:.{min(digits, 6)}f}"


def round_for_entry(value: float) -> float:
    """A converted value rounded to 8 significant digits for an entry field."""
    if not math.isfinite(value) or value == 0:
        return value
    return float(f"{value:.8g}")


def scale_zero(system, kind: str, ambient_pressure: float = DEFAULT_AMBIENT) -> float:
    """Display value of the physical zero of ``kind``: absolute zero temperature, zero
    absolute pressure (minus the ambient pressure on a gauge scale), else 0.

    Parameters
    ----------
    system : str or UnitSystem
        Display unit system.
    kind : str
        Kind of quantity.
    ambient_pressure : float
        Ambient pressure [Pa] for gauge pressures.

    Returns
    -------
    float
        The zero in display units (-273.15 for degC, -459.67 for degF, -ambient for gauge).
    """
    if kind in ("temperature", "pressure", "absolute_pressure"):
        return float(from_si(system, 0.0, kind, ambient_pressure))
    return 0.0


def round_for_kind(value: float, kind: str, system="SI",
                   ambient_pressure: float = DEFAULT_AMBIENT, significant: int = 5) -> float:
    """A display value rounded for an entry field: ``significant`` figures of the quantity.

    :func:`round_for_entry` keeps 8 significant digits of the number shown, so a converted
    value keeps long decimals (20 bar shows as 290.07548 psi), and it counts the digits of
    the number on the display scale, which for an offset scale is not the quantity: 0.3 degC
    would keep 8 digits of 0.3.  Here the figures are counted on the absolute quantity
    (temperature above absolute zero, gauge pressure plus ambient), so 303.15 K, 30 degC
    and 86 degF are all shown to 0.01 degree, 18.98675 bar(g) to 0.001 bar.

    Parameters
    ----------
    value : float
        Number in display units.
    kind : str
        Kind of quantity (see :func:`from_si`).
    system : str or UnitSystem
        Display unit system of ``value``.
    ambient_pressure : float
        Ambient pressure [Pa] for gauge pressures.
    significant : int
        Significant figures kept [-].

    Returns
    -------
    float
        The rounded number; zero and non-finite values are returned unchanged.
    """
    if not math.isfinite(value) or value == 0:
        return value
    magnitude = abs(value - scale_zero(system, kind, ambient_pressure))
    if not magnitude > 0:  # at the physical zero itself: round the number shown
        magnitude = abs(value)
    decimals = (significant - 1) - int(math.floor(math.log10(magnitude)))
    rounded = round(value, decimals)
    return float(rounded) if rounded != 0 else 0.0


def quoted_unit(system, kind: str) -> str:
    """Unit as quoted in a message: :func:`unit_label`, except an absolute pressure in psi
    is ``psia`` (common practice in US customary units, where psi alone is ambiguous)."""
    label = unit_label(system, kind)
    if kind in ("pressure", "absolute_pressure") and label == "psi":
        return "psia"
    return label


def format_typed(value: float) -> str:
    """Text of a number as typed: up to 10 significant digits, no trailing zeros."""
    return f"{value:.10g}"


class NumberEntry(widgets.HBox):
    """A labelled number entry (``FloatText``) with its unit, CSS class ``wb-input-<name>``.

    The entry keeps its value in SI units in :attr:`si`; the field shows it in the display
    unit system.  ``on_change(entry)`` is called after the user changes the number.

    A number typed (or set with :meth:`set_display`) is remembered with the unit system it
    was typed in: shown in that system again it comes back exactly as typed, whatever unit
    switches happened in between.  A converted value is rounded for the field, to 8
    significant digits (:func:`round_for_entry`) or, with ``significant`` given, to that many
    figures of the quantity (:func:`round_for_kind`).  Neither changes :attr:`si`.
    """

    def __init__(self, name: str, label: str, kind: str, si_value: float, on_change=None,
                 system="SI", ambient_pressure: float = DEFAULT_AMBIENT, width="330px",
                 significant: int | None = None):
        self.name = name
        self.kind = kind
        self.si = float(si_value)
        self.significant = significant
        self._system = _system(system)
        self._ambient = ambient_pressure
        self._on_change = on_change
        self._quiet = False
        self._typed = None  # (system, ambient, display value, si) of the last typed number
        self.field = widgets.FloatText(
            value=self._rounded(), continuous_update=False,
            layout=widgets.Layout(width="120px"))
        self.label = widgets.Label(label, layout=widgets.Layout(width="170px"))
        self.unit = widgets.Label(unit_label(self._system, kind),
                                  layout=widgets.Layout(width="60px"))
        super().__init__([self.label, self.field, self.unit],
                         layout=widgets.Layout(width=width, align_items="center"))
        self.add_class(f"wb-input-{name}")
        self.field.observe(self._changed, names="value")

    @property
    def value(self) -> float:
        """The number shown, in display units."""
        return self.field.value

    @property
    def display_value(self) -> float:
        """The SI value in display units, unrounded: the number as typed when it was typed
        in the current unit system, else the exact conversion."""
        typed = self._typed_value()
        if typed is not None:
            return typed
        return float(from_si(self._system, self.si, self.kind, self._ambient))

    @property
    def system(self):
        """The display unit system (``UnitSystem``)."""
        return self._system

    @property
    def ambient_pressure(self) -> float:
        """Ambient pressure [Pa] of gauge pressures."""
        return self._ambient

    def _typed_value(self):
        if self._typed is None:
            return None
        system, ambient, value, si = self._typed
        if system != self._system or si != self.si:
            return None
        if ambient != self._ambient and self.kind == "pressure" and self._system.gauge:
            return None
        return value

    def _remember(self, value: float):
        self._typed = (self._system, self._ambient, float(value), self.si)

    def _rounded(self) -> float:
        typed = self._typed_value()
        if typed is not None:
            return typed
        value = from_si(self._system, self.si, self.kind, self._ambient)
        if self.significant is None:
            return round_for_entry(value)
        return round_for_kind(value, self.kind, self._system, self._ambient, self.significant)

    def _changed(self, change):
        if self._quiet:
            return
        self.si = float(to_si(self._system, change["new"], self.kind, self._ambient))
        self._remember(change["new"])
        if self._on_change is not None:
            self._on_change(self)

    def set_display(self, value: float, notify: bool = True):
        """Set the number in display units (as if typed)."""
        value = float(value)
        if value == self.field.value:
            self.si = float(to_si(self._system, value, self.kind, self._ambient))
            self._remember(value)
            if notify and self._on_change is not None:
                self._on_change(self)
            return
        if notify:
            self.field.value = value
        else:
            with quiet_update(self):
                self.field.value = value
                self.si = float(to_si(self._system, value, self.kind, self._ambient))
                self._remember(value)

    def set_si(self, si_value: float):
        """Set the SI value and show it, without calling ``on_change``."""
        self.si = float(si_value)
        self._refresh()

    def set_system(self, system, ambient_pressure: float):
        """Show the SI value in another unit system (the SI value does not change)."""
        self._system = _system(system)
        self._ambient = ambient_pressure
        self.unit.value = unit_label(self._system, self.kind)
        self._refresh()

    def _refresh(self):
        with quiet_update(self):
            self.field.value = self._rounded()


class ResultField(widgets.HBox):
    """A labelled result: the value text is an ``HTML`` widget with class ``wb-result-<name>``."""

    def __init__(self, name: str, label: str, kind: str):
        self.name = name
        self.kind = kind
        self.label = widgets.Label(label, layout=widgets.Layout(width="215px"))
        self.text = widgets.HTML("–", layout=widgets.Layout(width="130px"))
        self.text.add_class(f"wb-result-{name}")
        super().__init__([self.label, self.text])

    def show(self, text: str):
        self.text.value = html.escape(text)

    @property
    def shown(self) -> str:
        return html.unescape(self.text.value)

    def set_stale(self, stale: bool):
        self.text.style.text_color = STALE_COLOUR if stale else None


def unit_switch(value: str = "bar, degC") -> widgets.Dropdown:
    """Dropdown of the display unit systems (class ``wb-input-unit-system``)."""
    w = widgets.Dropdown(options=list(UNIT_SYSTEMS), value=value, description="Units",
                         layout=widgets.Layout(width="240px"))
    w.add_class("wb-input-unit-system")
    return w


def message_area() -> MessageArea:
    """A new :class:`MessageArea` (kept for panels built before :class:`Panel`)."""
    return MessageArea()


def caution_banner(text: str) -> widgets.HTML:
    """A neutral banner with the safety caution (class ``wb-caution``)."""
    w = widgets.HTML(
        f"<div style='box-sizing:border-box;border:1px solid #999;padding:4px 8px;"
        f"background:#f6f6f2;font-size:90%'><b>Caution.</b> {html.escape(text)}</div>",
        layout=widgets.Layout(width="auto", max_width="100%"))
    w.add_class("wb-caution")
    return w


def choice(name: str, label: str, options, value) -> widgets.Dropdown:
    """A labelled dropdown with class ``wb-input-<name>``."""
    w = widgets.Dropdown(options=list(options), value=value, description=label,
                         style={"description_width": "170px"},
                         layout=widgets.Layout(width="330px"))
    w.add_class(f"wb-input-{name}")
    return w


# ---------------------------------------------------------------------------- plumbing
#: Text colours of the message levels and of stale results (neutral, no status colour code).
MESSAGE_COLOURS = {"info": "#333333", "error": "#9a3b00", "caution": "#6b5200"}
STALE_COLOUR = "#8a8a8a"


def input_class(widget, name: str):
    """Give ``widget`` the test hook class ``wb-input-<name>`` and return it."""
    widget.add_class(f"wb-input-{name}")
    return widget


def result_class(widget, name: str):
    """Give ``widget`` the test hook class ``wb-result-<name>`` and return it."""
    widget.add_class(f"wb-result-{name}")
    return widget


@contextlib.contextmanager
def quiet_update(owner):
    """Set widget values without running ``owner``'s observers.

    ``owner`` is a panel or an entry with a boolean ``_quiet`` attribute that its guarded
    callbacks check (:meth:`Panel.guard` does).  Nested use is safe: the previous value is
    restored on exit, also when the body raises.

    Examples
    --------
    >>> class Owner:
    ...     _quiet = False
    >>> owner = Owner()
    >>> with quiet_update(owner):
    ...     owner._quiet
    True
    >>> owner._quiet
    False
    """
    before = getattr(owner, "_quiet", False)
    owner._quiet = True
    try:
        yield owner
    finally:
        owner._quiet = before


def download_link(content, file_name: str, label: str, mime: str = "text/csv") -> str:
    """HTML of a link that downloads ``content`` (text or bytes) as ``file_name``.

    The content travels inside the link as a base64 ``data:`` URL, so a served dashboard
    needs no file on the server.  The file name and label are escaped.

    Examples
    --------
    >>> download_link("a,b\\n1,2\\n", "sweep.csv", "download the table (CSV)")[:51]
    "<a download='sweep.csv' href='data:text/csv;base64,"
    """
    data = content.encode("utf-8") if isinstance(content, str) else bytes(content)
    encoded = base64.b64encode(data).decode("ascii")
    name = html.escape(str(file_name), quote=True)
    return (f"<a download='{name}' href='data:{mime};base64,{encoded}' "
            f"target='_blank'>{html.escape(str(label))}</a>")


def describe_error(exc: BaseException) -> str:
    """Plain one-line text of an error for the message area, never a traceback.

    A :class:`~workbench.errors.WorkbenchError` is shown as it is (its message names the
    input, the value and the allowed range).  Any other exception is a defect, not a bad
    input: its own text may be a library's raw message, so only its class is named.
    """
    if isinstance(exc, WorkbenchError):
        text = " ".join(str(exc).split())
        return text or exc.__class__.__name__
    return (f"unexpected error ({exc.__class__.__name__}): the calculation stopped; check "
            "the inputs, and please report it if they are reasonable")


class MessageArea(widgets.HTML):
    """The one message area of a panel (class ``wb-message``): plain text, escaped.

    ``level`` is ``""`` (empty), ``"info"``, ``"caution"`` or ``"error"``; :attr:`text` is
    the plain text shown.  Cautions are listed after the message, each once.
    """

    def __init__(self):
        super().__init__("", layout=widgets.Layout(min_height="24px", width="100%"))
        self.add_class("wb-message")
        self.text = ""
        self.level = ""

    def show(self, text: str, *, error: bool = False, cautions=()) -> None:
        """Show ``text`` (an error when ``error``), then each caution once."""
        parts = [str(text).strip()] if str(text).strip() else []
        seen = set()
        for caution in cautions:
            caution = " ".join(str(caution).split())
            if caution and caution not in seen:
                seen.add(caution)
                parts.append(f"caution: {caution}")
        self.text = "; ".join(parts)
        self.level = "" if not parts else "error" if error else (
            "caution" if seen else "info")
        if not parts:
            self.value = ""
            return
        colour = MESSAGE_COLOURS[self.level]
        self.value = (f"<div style='color:{colour};padding:2px 0'>"
                      f"{html.escape(self.text, quote=False)}</div>")

    def show_error(self, error, prefix: str = "") -> None:
        """Show an exception (see :func:`describe_error`) or a text as an error."""
        text = describe_error(error) if isinstance(error, BaseException) else str(error)
        self.show(prefix + text, error=True)

    def clear(self) -> None:
        """Empty the message area."""
        self.show("")


class ResultRows(widgets.VBox):
    """Result rows of fields described in :data:`workbench.fields.FIELDS`.

    Each row is a :class:`ResultField` with the field's label and the class
    ``wb-result-<name>`` (underscores of the field name become dashes).  Values are given
    in SI units and shown in the display unit system; efficiencies and shares (the fields
    named in ``percent``) are shown in percent.

    Parameters
    ----------
    names : sequence of str
        Field names (keys of ``FIELDS``), in the order shown.
    percent : collection of str
        Field names shown in percent.
    context : dict, optional
        Field name -> a few words that say where the value comes from, shown after the
        table's label ("volume flow (operating point)").  Labels themselves are those of the
        table: a panel has no second list of result names.
    """

    def __init__(self, names, percent=(), context=None):
        from ..fields import field

        context = dict(context or {})
        self.fields = {name: field(name) for name in names}
        self.kinds = {name: "percent" if name in percent else f.kind
                      for name, f in self.fields.items()}
        self.rows = {hook(name): ResultField(
            hook(name), f.label + (f" ({context[name]})" if name in context else ""),
            self.kinds[name]) for name, f in self.fields.items()}
        super().__init__(list(self.rows.values()))

    def show(self, values: dict, system, ambient_pressure: float = DEFAULT_AMBIENT,
             notes=None) -> None:
        """Show SI ``values`` (field name -> number; missing or NaN shows a dash).

        ``notes`` maps a field name to a text shown instead of the number.
        """
        notes = notes or {}
        for name, kind in self.kinds.items():
            row = self.rows[hook(name)]
            if name in notes:
                row.show(notes[name])
                continue
            value = values.get(name)
            if value is None or not math.isfinite(value):
                row.show("–")
                continue
            number = format_number(from_si(system, value, kind, ambient_pressure), kind)
            unit = unit_label(system, kind)
            row.show(number if unit == "-" else f"{number} {unit}")

    def clear(self) -> None:
        """Show a dash in every row."""
        for row in self.rows.values():
            row.show("–")

    def set_stale(self, stale: bool) -> None:
        """Grey every value (stale) or show it normally."""
        for row in self.rows.values():
            row.set_stale(stale)

    def shown(self, name: str) -> str:
        """Text shown in row ``name`` (field name or hook name)."""
        return self.rows[hook(name)].shown

    def __getitem__(self, name: str) -> ResultField:
        """The row of a field (field name or hook name)."""
        return self.rows[hook(name)]


def hook(name: str) -> str:
    """Hook name of a field or entry name: ``"shaft_power"`` -> ``"shaft-power"``."""
    return str(name).strip().replace("_", "-")


class Panel(widgets.VBox):
    """Base of every panel: one message area, one caution banner, guarded callbacks.

    A subclass builds its widgets (calling :meth:`_ensure_plumbing` first if it needs
    :attr:`message` while building), places :attr:`caution` and :attr:`message` in its
    children and calls ``super().__init__(children)``.  It registers its result widgets (anything with ``set_stale``) with
    :meth:`add_result_widget`, wraps every observer with :meth:`guard`, and reports a good
    result with :meth:`show_result`.

    Attributes
    ----------
    message : MessageArea
        The one message area (class ``wb-message``).
    caution : ipywidgets.HTML
        The safety caution banner (class ``wb-caution``), once per panel.
    result : object or None
        The last good result.
    stale : bool
        True when the result shown belongs to earlier inputs.
    """

    css_class = "wb-panel"

    def __init__(self, children=(), **kwargs):
        self._ensure_plumbing()
        super().__init__(list(children), **kwargs)
        self.add_class(self.css_class)

    def _ensure_plumbing(self):
        """Create the plumbing attributes once (a subclass may need them while building)."""
        if getattr(self, "_plumbed", False):
            return
        self._plumbed = True
        self._quiet = False
        self.result = None
        self.stale = False
        self._result_widgets = []
        self.message = MessageArea()
        from .. import SAFETY_CAUTION

        self.caution = caution_banner(SAFETY_CAUTION)

    def quiet(self):
        """Context manager: set widget values without running this panel's callbacks."""
        self._ensure_plumbing()
        return quiet_update(self)

    def guard(self, callback, prefix: str = ""):
        """``callback`` wrapped for an observer or button: skipped during :meth:`quiet`;
        an exception is shown in the message area (with ``prefix``), never raised, and the
        last good result stays, marked stale.  The wrapped call returns None on failure."""
        def guarded(*args, **kwargs):
            if self._quiet:
                return None
            return self.attempt(callback, *args, prefix=prefix, **kwargs)[1]
        guarded.__name__ = getattr(callback, "__name__", "guarded")
        guarded.__doc__ = getattr(callback, "__doc__", None)
        return guarded

    def attempt(self, func, *args, prefix: str = "", stale: bool = True, **kwargs):
        """Call ``func(*args, **kwargs)``; return ``(True, its value)``, or show the error
        (with ``prefix``) and return ``(False, None)``.

        The one place where panels catch every exception: a bad input's
        :class:`~workbench.errors.WorkbenchError` is shown as it is, anything else as a plain
        sentence (:func:`describe_error`).  With ``stale`` the shown result is marked stale
        (:meth:`fail`); without, only the message is shown (a chart that could not be
        drawn leaves good numbers good).
        """
        try:
            return True, func(*args, **kwargs)
        except Exception as exc:  # noqa: BLE001 - nothing escapes into the page
            if stale:
                self.fail(exc, prefix)
            else:
                self.message.show_error(exc, prefix)
            return False, None

    def fail(self, error, prefix: str = "") -> None:
        """Show ``error`` (exception or text) and mark the shown result stale."""
        self._ensure_plumbing()
        self.message.show_error(error, prefix)
        self.set_stale(self.result is not None)

    def show_result(self, result, text: str = "", cautions=()) -> None:
        """Keep ``result`` as the last good one, unmark stale and show ``text``."""
        self._ensure_plumbing()
        self.result = result
        self.set_stale(False)
        self.message.show(text, cautions=cautions)

    def add_result_widget(self, widget):
        """Register a widget with ``set_stale(bool)`` to grey with the result; returns it."""
        self._ensure_plumbing()
        self._result_widgets.append(widget)
        return widget

    def set_stale(self, stale: bool) -> None:
        """Mark the shown result stale (grey) or current; subclasses may extend it."""
        self._ensure_plumbing()
        self.stale = bool(stale)
        for widget in self._result_widgets:
            widget.set_stale(self.stale)
