from .start import program

program()
