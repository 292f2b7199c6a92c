"""``kitgen check``: how well a kit tells the time, from its own geometry
as printed (#10).  :mod:`.reading` reads the parts as a user does,
:mod:`.accuracy` compares readings with the astronomical computation, and
:mod:`.report` says the figures in the kit's language."""
