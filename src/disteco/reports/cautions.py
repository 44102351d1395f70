"""The standing cautions printed and written with every result."""

CAUTIONS = (
    "Screening estimate (AACE class 4-5): expect the installed cost to lie within about -30 % / +50 % "
    "to -50 % / +100 % of the figures given.",
    "Vessel and exchanger mechanical design must follow the applicable code (for example ASME "
    "Section VIII) and be checked by a qualified, licensed engineer.",
    "Flammable or toxic service, pressure relief and plant layout are out of scope.",
)
