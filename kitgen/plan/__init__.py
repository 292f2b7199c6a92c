"""The build plan: everything one build needs, resolved once from the
recipe and frozen (:func:`kitgen.plan.resolve.plan_kit`).  The layers
below the plan (sky, parts, layout, renderers) read the plan, never the
recipe."""
