"""kitgen: printable paper planispheric astrolabe kits for any latitude.

The build is one pipeline: recipe -> sky -> projection -> parts -> layout ->
renderers; see DEVELOPERS.md for the map.
"""

__version__ = "0.1.0"
