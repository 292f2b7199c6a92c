"""``kitgen serve``: a local web page for teachers (#13).

The web layer sits on top of the pipeline, beside :mod:`kitgen.cli`: it
turns a form into the same recipe tree a YAML file gives, validates it
with the same code (:func:`kitgen.recipe.load.validate_recipe`), builds
with :func:`kitgen.kit.build_kit` and answers with the render backends'
bytes.  Nothing below it knows it exists.

- :mod:`.form` -- form fields (named as the recipe keys) to recipe tree,
  and the validation messages beside each field.
- :mod:`.language` -- the page's language, from ``Accept-Language``.
- :mod:`.pool` -- the bounded build pool and its queue ("busy" when full).
- :mod:`.guard` -- request size limits, CSRF tokens, security headers.
- :mod:`.sets` -- class sets, built by ``kitgen batch`` in a private
  temporary folder.
- :mod:`.app` -- the Starlette application; :mod:`.server` -- binding and
  starting uvicorn.
"""
