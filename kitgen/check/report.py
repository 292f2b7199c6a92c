"""The accuracy report's lines, in the kit's language (#10): every word
from the templates' ``check`` section, numbers as the language writes
them."""

from __future__ import annotations

from ..parts.format import latitude_text
from .accuracy import Accuracy, Errors


def _pair(words, key: str, errors: Errors) -> str:
    return words(key, worst=words.number(errors.worst_min, 1), median=words.number(errors.median_min, 1))


def report_lines(kit, accuracy: Accuracy, target_min: float | None = None,
                 diameter_mm: float | None = None) -> list[str]:
    """The report, one line a list item (indented lines belong to the line
    above); with a target, the size that reaches it (``diameter_mm``, None
    for none: :func:`kitgen.check.accuracy.diameter_for_target`)."""
    w, plan = kit.words, kit.plan
    out = [w("check.title", title=plan.title or w("kit.default_title"),
             latitude=latitude_text(w, plan.plates[0].latitude_deg), year=w.number(plan.epoch))]
    if accuracy.sun_exact is None:
        out.append(w("check.no_sun"))
    else:
        out += [w("check.sun", count=w.number(accuracy.sun_exact.count)),
                _pair(w, "check.exact", accuracy.sun_exact), _pair(w, "check.graduated", accuracy.sun_graduated)]
    if accuracy.star_exact is None:
        out.append(w("check.no_stars"))
    else:
        out += [w("check.stars", count=w.number(accuracy.star_exact.count), stars=w.number(accuracy.star_count)),
                _pair(w, "check.exact", accuracy.star_exact), _pair(w, "check.graduated", accuracy.star_graduated),
                w("check.star_note")]
    scale = accuracy.limiting_scale
    if scale is not None:
        worst = dict(accuracy.by_scale)[scale]
        out.append(w("check.limit", part=w("check.scale_" + scale), worst=w.number(worst, 1)))
    if target_min is not None:
        target = w.number(target_min, 0 if float(target_min).is_integer() else 1)
        if diameter_mm is None:
            out.append(w("check.target_none", target=target))
        elif diameter_mm == plan.diameter_mm:
            out.append(w("check.target_now", target=target))
        else:
            out.append(w("check.target_size", target=target, diameter=w.number(diameter_mm)))
    return out
