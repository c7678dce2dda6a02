"""Catalogue pages, one module per page group; urls.py names them."""
