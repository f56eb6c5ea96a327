"""The spec: a design requirement read from TOML (or built in Python), validated with pydantic.

Errors name the field path, the value and what is expected, and suggest the
nearest valid key for a misspelt one.
"""

from __future__ import annotations

import os
import tomllib
from pathlib import Path
from typing import Annotated, Any

from pydantic import AfterValidator, BaseModel, ConfigDict, Field, ValidationError, field_validator

from selector.errors import InputError, SpecError
from selector.inputs.limits import check_range, check_toml_text
from selector.inputs.properties import FAMILIES, PROPERTIES, RATINGS
from selector.inputs.spec_keys import key_problems
from selector.inputs.spec_quantities import DIMENSION_FIELDS, UNIT_OF_KEY, quantity_problems
from selector.mechanics.failure_modes import CRITERIA
from selector.mechanics.loadcases import CONSTRAINTS, FREE_VARIABLES, FUNCTIONS
from selector.mechanics.objectives import OBJECTIVES
from selector.suggest import did_you_mean

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"  # the bundled example specs
DEMO_SPEC = "camera-dolly-boom.toml"

QUANTITY_KEYS = frozenset(UNIT_OF_KEY)
"""Keys whose value is a quantity: text with a number and its unit."""


def _one_of(choices: tuple[str, ...], noun: str) -> AfterValidator:
    """A validator accepting only ``choices``, suggesting the nearest one otherwise."""

    def check(value: str) -> str:
        if value not in choices:
            raise ValueError(f"{value!r} is not {noun}; {did_you_mean(value, choices)}")
        return value

    return AfterValidator(check)


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


class Part(_Strict):
    """What the part is and what it carries. Quantities are text with units ("1.8 m")."""

    function: Annotated[str, _one_of(FUNCTIONS, "a function")]
    support: str | None = None
    load: str | None = None
    length: str | None = None
    force: str | None = None
    torque: str | None = None
    pressure: str | None = None
    energy: str | None = None
    width: str | None = None
    radius: str | None = None
    form: str | None = None  # springs: uniform, leaf, coil, torsion-bar
    edges: str | None = None  # plates: supported, clamped, free-sides; panels: free-sides


class SectionSpec(_Strict):
    """The cross-section: its shape, what may change, and its reference dimensions."""

    shape: str = "generic"
    free: Annotated[str, _one_of(FREE_VARIABLES, "a free variable")] = "scale"
    b: str | None = None
    h: str | None = None
    d: str | None = None
    t: str | None = None
    tf: str | None = None
    tw: str | None = None
    min_wall: str | None = None  # the thinnest wall or plate allowed (product forms set their own too)
    max_depth: str | None = None  # bounds on the sized part (see pipeline/bounds.py)
    max_width: str | None = None
    max_diameter: str | None = None

    @property
    def dims(self) -> dict[str, str]:
        """The dimensions given, name → quantity text."""
        return {k: getattr(self, k) for k in DIMENSION_FIELDS if getattr(self, k) is not None}


class SandwichSpec(_Strict):
    """Which classes may be faces and cores (families or class ids) and the thickness bounds."""

    faces: list[str] | None = None
    cores: list[str] | None = None
    min_face: str | None = None
    min_core: str | None = None
    max_depth: str | None = None


class Objective(_Strict):
    minimize: Annotated[str, _one_of(OBJECTIVES, "an objective")] = "mass"


class Constraint(_Strict):
    """One requirement the part must meet; limits are quantities with units.

    fracture: ``crack_length`` a, ``geometry_factor`` Y (default 1.12), or a vessel's
    ``criterion``; fatigue: ``load_ratio`` R (default −1); frequency: ``min_frequency``.
    """

    type: Annotated[str, _one_of(CONSTRAINTS, "a constraint type")]
    max_deflection: str | None = None
    max_twist: str | None = None
    safety_factor: float = Field(default=1.0, gt=0, allow_inf_nan=False, strict=True)
    crack_length: str | None = None
    geometry_factor: float | None = Field(default=None, gt=0, allow_inf_nan=False, strict=True)
    criterion: Annotated[str, _one_of(CRITERIA, "a fracture criterion")] | None = None
    load_ratio: float | None = Field(default=None, ge=-1, lt=1, allow_inf_nan=False, strict=True)
    min_frequency: str | None = None


class Materials(_Strict):
    files: list[str] = Field(default_factory=list)
    builtin: bool = Field(default=True, strict=True)


SCREEN_KEYS = (*PROPERTIES, *RATINGS, "families", "exclude_families", "exclude", "allow_brittle")


class Spec(_Strict):
    """A design requirement: function, objective, constraints, free variable, screens."""

    title: str = "Untitled part"
    notes: str = ""
    index: str | None = None
    units: str = "si"
    part: Part
    section: SectionSpec = Field(default_factory=SectionSpec)
    objective: Objective = Field(default_factory=Objective)
    constraint: list[Constraint] = Field(default_factory=list)
    screen: dict[str, Any] = Field(default_factory=dict)
    materials: Materials = Field(default_factory=Materials)
    sandwich: SandwichSpec | None = None

    @field_validator("units")
    @classmethod
    def _known_units(cls, value: str) -> str:
        if value not in ("si", "us"):
            raise ValueError(f"{value!r} is not a units system; expected 'si' or 'us'")
        return value

    @field_validator("screen")
    @classmethod
    def _known_screens(cls, value: dict[str, Any]) -> dict[str, Any]:
        for key, limit in value.items():
            if key not in SCREEN_KEYS:
                raise ValueError(f"unknown screen {key!r}; {did_you_mean(key, SCREEN_KEYS)}")
            if key in ("families", "exclude_families"):
                if not isinstance(limit, list) or any(f not in FAMILIES for f in limit):
                    if not isinstance(limit, list):
                        raise ValueError(f"{key} = {limit!r}; expected a list of: {', '.join(FAMILIES)}")
                    bad = next(f for f in limit if f not in FAMILIES)
                    hint = did_you_mean(str(bad), FAMILIES, keep_order=True)
                    raise ValueError(f"{key}: {bad!r} is not a family; {hint}")
            elif key == "allow_brittle":
                if not isinstance(limit, bool):
                    raise ValueError(f"allow_brittle = {limit!r}; expected true or false")
            elif key == "exclude":
                if not isinstance(limit, list) or not all(isinstance(i, str) for i in limit):
                    raise ValueError(f"exclude = {limit!r}; expected a list of class ids")
            elif not isinstance(limit, str):
                raise ValueError(f'screen {key} = {limit!r}; expected text such as ">= 60 degC"')
        return value


def _location(loc: tuple[int | str, ...]) -> str:
    out = ""
    for part in loc:
        out += f"[{part}]" if isinstance(part, int) else (f".{part}" if out else str(part))
    return out


def _fields_of(model: type[BaseModel], loc: tuple[int | str, ...]) -> list[str]:
    """Valid field names at ``loc`` inside ``model`` (for suggestions)."""
    current: Any = model
    for part in loc[:-1]:
        if isinstance(part, int):
            continue
        info = current.model_fields.get(part)
        if info is None:
            return []
        ann = info.annotation
        args = getattr(ann, "__args__", ())
        candidates = [ann, *args]
        current = next((c for c in candidates if isinstance(c, type) and issubclass(c, BaseModel)), None)
        if current is None:
            return []
    return list(current.model_fields)


def _problem(error: Any, source: str) -> InputError:
    """One pydantic validation error as an InputError with its field path and location."""
    loc = tuple(error["loc"])
    where = f"{source}: {_location(loc)}"
    if error["type"] == "extra_forbidden":
        key = str(loc[-1])
        return InputError(where, f"unknown key {key!r}", did_you_mean(key, _fields_of(Spec, loc)), loc)
    if error["type"] == "missing":
        return InputError(where, "required field is missing", "see examples/", loc)
    value = error.get("input")
    if error["type"] == "float_type":  # strict numbers: true/false and quoted text are refused
        return InputError(where, f"{value!r} is not a number", "a plain number such as 1.5, unquoted", loc)
    if error["type"] == "bool_type":
        return InputError(where, f"{value!r} is not true or false", "true or false, unquoted", loc)
    if error["type"] == "string_type" and loc and loc[-1] in QUANTITY_KEYS:
        return InputError(
            where, f"{value!r} is not a quantity", 'a number and its unit in quotes, e.g. "1.2 m"', loc
        )
    if error["type"] == "string_type":
        return InputError(where, f"{value!r} is not text", "text in quotes", loc)
    if error["type"] == "finite_number":
        return InputError(where, f"{value!r} is not a finite number", "a plain number such as 1.5", loc)
    message = error["msg"].removeprefix("Value error, ")
    what, _, expected = message.partition("; ")
    if not expected:
        what, expected = f"{error.get('input')!r} is not valid", message
    return InputError(where, what, expected, loc)


def spec_from_dict(data: dict[str, Any], source: str = "spec") -> Spec:
    """Validate a spec given as nested dicts; a key its function, shape or constraint does not
    read is a problem too (``spec_keys``), and so is a quantity that does not read in its SI
    unit within range (``spec_quantities``).

    Raises:
        SpecError: listing every problem found, each with its field path and location.
    """
    unread = key_problems(data, source) if isinstance(data, dict) else []
    try:
        spec = Spec.model_validate(data)
    except ValidationError as exc:
        problems = [_problem(e, source) for e in exc.errors()]
        seen = {p.location for p in problems}
        raise SpecError(problems + [p for p in unread if p.location not in seen]) from None
    problems = [*unread, *quantity_problems(spec, source)]
    if problems:
        raise SpecError(problems)
    return spec


def _beside(spec: Spec, folder: Path) -> Spec:
    """The spec with its materials files resolved against ``folder`` (the spec file's own)."""
    if not spec.materials.files:
        return spec
    files = [os.path.abspath(folder / f) for f in spec.materials.files]
    return spec.model_copy(update={"materials": spec.materials.model_copy(update={"files": files})})


def load_spec(path: str | Path) -> Spec:
    """Read and validate a spec file (TOML); its materials files are found beside it."""
    file = Path(path)
    try:
        text = file.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise InputError(str(file), "no such file", "the path of a spec file (TOML)") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(
            str(file), f"cannot be read ({exc.__class__.__name__})", "a UTF-8 TOML file"
        ) from None
    check_toml_text(text, str(file))
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(str(file), f"is not valid TOML: {exc}", "TOML as in examples/") from None
    return _beside(spec_from_dict(data, source=str(file)), file.parent)


def parse_dimension_args(shape: str, args: tuple[str, ...] | list[str]) -> dict[str, float]:
    """Parse ``("b=100mm", "h=200 mm")`` into SI values (moduli such as E_face in Pa)."""
    from selector.inputs.units import magnitude_in

    dims: dict[str, float] = {}
    for arg in args:
        name, sep, text = arg.partition("=")
        if not sep or not name.strip() or not text.strip():
            raise InputError(f"section {shape}", f"cannot read {arg!r}", "NAME=VALUE with a unit, e.g. t=2mm")
        name = name.strip()
        unit = "Pa" if name.startswith("E_") else "m"
        if name in dims:
            raise InputError(f"section {shape}: {name}", f"{name} is given twice", "each dimension once")
        where = f"section {shape}: {name}"
        dims[name] = check_range(magnitude_in(text.strip(), unit, where), unit, where, text.strip())
    return dims
